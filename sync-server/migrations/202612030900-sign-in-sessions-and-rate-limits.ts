import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// sign_in_sessions: one row per sign-in (the refresh-token family). Access tokens carry its id, so signing out
// (or a replayed refresh token) ends the access token too; the lookup is by primary key on every request.
// rate_limit_hits: failure counters shared by every server process on the database (express-rate-limit's store).
// UNLOGGED: a counter lost in a crash only gives back a few tries, and it spares the write-ahead log.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await q(`CREATE TABLE sign_in_sessions (
      id uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
      ended_at timestamptz NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    )`);
    await q(`CREATE INDEX sign_in_sessions_user ON sign_in_sessions (user_id)`);
    // Each existing family becomes a session; one whose tokens are all revoked has already ended.
    await q(`INSERT INTO sign_in_sessions (id, user_id, ended_at, created_at)
      SELECT family_id, min(user_id::text)::uuid,
             CASE WHEN bool_and(revoked_at IS NOT NULL) THEN max(revoked_at) END, min(created_at)
      FROM refresh_tokens GROUP BY family_id`);
    await q(`ALTER TABLE refresh_tokens ADD CONSTRAINT refresh_tokens_session
      FOREIGN KEY (family_id) REFERENCES sign_in_sessions (id) ON DELETE CASCADE`);
    await q(`CREATE UNLOGGED TABLE rate_limit_hits (
      key text PRIMARY KEY,
      hits integer NOT NULL,
      resets_at timestamptz NOT NULL
    )`);
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP TABLE IF EXISTS rate_limit_hits`);
  await qi.sequelize.query(`ALTER TABLE refresh_tokens DROP CONSTRAINT IF EXISTS refresh_tokens_session`);
  await qi.sequelize.query(`DROP TABLE IF EXISTS sign_in_sessions`);
};
