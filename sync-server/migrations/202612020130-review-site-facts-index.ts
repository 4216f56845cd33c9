import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// Site rows are wide (the analysis JSONB sits inline when it compresses small), so the review filters read
// their few facts from this covering index instead of the table.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(
    `CREATE INDEX site_recordings_review_facts ON site_recordings (clinic_id, session_id)
       INCLUDE (site, quality_verdict, review_irregular, review_heart_rate, review_systolic_activity, review_diastolic_activity)
       WHERE deleted_at IS NULL`,
  );
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP INDEX IF EXISTS site_recordings_review_facts`);
};
