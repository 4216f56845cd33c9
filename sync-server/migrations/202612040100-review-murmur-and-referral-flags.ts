import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The murmur screen of the analysis of record (`analysis.screen.murmur`) flags a site for referral like a rate
// out of range, so the review filter reads it from a generated column beside the other site facts. Analyses made
// before the screen existed have no `screen`: they read as no possible murmur.
// A practitioner may also flag a session by hand, with a note; that lives in its own table (not a synced field:
// devices never see or change it), one row per flagged session, deleted when the flag is cleared.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await q(
      `ALTER TABLE site_recordings ADD COLUMN review_possible_murmur boolean
         GENERATED ALWAYS AS (coalesce(analysis->'screen'->>'murmur' = 'possible', false)) STORED`,
    );
    await q(`DROP INDEX IF EXISTS site_recordings_review_facts`);
    await q(
      `CREATE INDEX site_recordings_review_facts ON site_recordings (clinic_id, session_id)
         INCLUDE (site, quality_verdict, review_irregular, review_heart_rate, review_systolic_activity,
                  review_diastolic_activity, review_possible_murmur)
         WHERE deleted_at IS NULL`,
    );
    await q(
      `CREATE TABLE session_referral_flags (
         clinic_id uuid NOT NULL REFERENCES clinics(id) ON DELETE CASCADE,
         session_id uuid NOT NULL REFERENCES recording_sessions(id) ON DELETE CASCADE,
         note text NOT NULL CHECK (length(btrim(note)) > 0),
         flagged_by uuid NULL REFERENCES users(id) ON DELETE SET NULL,
         flagged_at timestamptz NOT NULL DEFAULT now(),
         PRIMARY KEY (clinic_id, session_id)
       )`,
    );
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await q(`DROP TABLE IF EXISTS session_referral_flags`);
    await q(`DROP INDEX IF EXISTS site_recordings_review_facts`);
    await q(`ALTER TABLE site_recordings DROP COLUMN IF EXISTS review_possible_murmur`);
    await q(
      `CREATE INDEX site_recordings_review_facts ON site_recordings (clinic_id, session_id)
         INCLUDE (site, quality_verdict, review_irregular, review_heart_rate, review_systolic_activity, review_diastolic_activity)
         WHERE deleted_at IS NULL`,
    );
  });
};
