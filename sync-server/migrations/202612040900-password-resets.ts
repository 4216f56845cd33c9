import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// One row per password-reset link sent. The link names the row and is signed over the account's address and
// current password hash, so it works for that account only, once (used_at, and the hash changes), and until
// expires_at. No clinic column: a reset belongs to the account, and asking for one changes nothing of a clinic's.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`CREATE TABLE password_resets (
    id uuid PRIMARY KEY,
    user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
    expires_at timestamptz NOT NULL,
    used_at timestamptz NULL,
    created_at timestamptz NOT NULL DEFAULT now()
  )`);
  await qi.sequelize.query(`CREATE INDEX password_resets_user ON password_resets (user_id)`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP TABLE IF EXISTS password_resets`);
};
