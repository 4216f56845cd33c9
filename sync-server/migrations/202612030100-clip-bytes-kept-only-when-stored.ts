import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// A refused clip (not sealed, sealed for another clinic, unreadable) keeps its row, so the device and the admin
// see why, but no bytes: its storage_key is NULL. Erased clips' bytes are deleted from the blob store after the
// erasure commits; each pending delete is a row here until the store confirms it, so a failed delete is retried
// by the purge instead of being forgotten.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    await qi.sequelize.query(`ALTER TABLE clip_blobs ALTER COLUMN storage_key DROP NOT NULL`, {
      transaction,
    });
    await qi.sequelize.query(
      `ALTER TABLE clip_blobs ADD CONSTRAINT clip_blobs_stored_has_key CHECK (state <> 'stored' OR storage_key IS NOT NULL)`,
      { transaction },
    );
    await qi.sequelize.query(
      `CREATE TABLE blob_deletions (
         storage_key text PRIMARY KEY,
         clinic_id uuid NOT NULL,
         erasure_id uuid NULL REFERENCES client_erasures (id) ON DELETE SET NULL,
         attempts integer NOT NULL DEFAULT 0,
         last_error text NULL,
         created_at timestamptz NOT NULL DEFAULT now(),
         updated_at timestamptz NOT NULL DEFAULT now()
       )`,
      { transaction },
    );
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    await qi.sequelize.query(`DROP TABLE IF EXISTS blob_deletions`, { transaction });
    await qi.sequelize.query(`ALTER TABLE clip_blobs DROP CONSTRAINT IF EXISTS clip_blobs_stored_has_key`, {
      transaction,
    });
    await qi.sequelize.query(`UPDATE clip_blobs SET storage_key = '' WHERE storage_key IS NULL`, {
      transaction,
    });
    await qi.sequelize.query(`ALTER TABLE clip_blobs ALTER COLUMN storage_key SET NOT NULL`, { transaction });
  });
};
