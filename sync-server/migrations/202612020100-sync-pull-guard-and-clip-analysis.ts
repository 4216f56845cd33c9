import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

const SYNCABLE = ['clients', 'consents', 'recording_sessions', 'site_recordings'] as const;

/*
 * A pull must never step past a change number that a still-open transaction holds, or that change is lost when it
 * commits later. Every write of a syncable row takes a shared per-clinic advisory lock before it takes its number,
 * and keeps it to commit; a pull takes the same lock exclusively for an instant, which waits out the writers in
 * flight, and reads the sequence's last value there: every number up to it is then committed or rolled back.
 * (Class 7301 with the two-integer form, so it cannot meet the migrator's single-key lock.)
 */
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await q(`CREATE OR REPLACE FUNCTION bump_change_seq() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        PERFORM pg_advisory_xact_lock_shared(7301, hashtext(NEW.clinic_id::text));
        NEW.change_seq := nextval('sync_change_seq');
        RETURN NEW;
      END $$`);
    for (const table of SYNCABLE) {
      await q(
        `CREATE TRIGGER ${table}_change_seq_insert BEFORE INSERT ON ${table} FOR EACH ROW EXECUTE FUNCTION bump_change_seq()`,
      );
    }

    await q(`ALTER TABLE clip_blobs ADD COLUMN analysis jsonb, ADD COLUMN failure text`);
    await q(`ALTER TABLE applied_mutations ADD COLUMN device_id uuid`);
    await q(`CREATE INDEX applied_mutations_row ON applied_mutations (row_id, applied_at)`);
    await q(
      `ALTER TABLE sync_conflicts ADD COLUMN device_id uuid, ADD COLUMN user_id uuid REFERENCES users(id) ON DELETE SET NULL`,
    );
    await q(
      `CREATE INDEX site_recordings_clip ON site_recordings (clinic_id, clip_sha256) WHERE clip_sha256 IS NOT NULL`,
    );
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await q(`DROP INDEX IF EXISTS site_recordings_clip`);
    await q(`ALTER TABLE sync_conflicts DROP COLUMN IF EXISTS device_id, DROP COLUMN IF EXISTS user_id`);
    await q(`DROP INDEX IF EXISTS applied_mutations_row`);
    await q(`ALTER TABLE applied_mutations DROP COLUMN IF EXISTS device_id`);
    await q(`ALTER TABLE clip_blobs DROP COLUMN IF EXISTS analysis, DROP COLUMN IF EXISTS failure`);
    for (const table of SYNCABLE) await q(`DROP TRIGGER IF EXISTS ${table}_change_seq_insert ON ${table}`);
    await q(`CREATE OR REPLACE FUNCTION bump_change_seq() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN NEW.change_seq := nextval('sync_change_seq'); RETURN NEW; END $$`);
  });
};
