import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// When a report e-mail that failed on a temporary error is sent again by the server on its own; NULL means it
// waits for a person (a permanent refusal, or the attempts are used up).
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    await qi.sequelize.query(`ALTER TABLE report_mails ADD COLUMN next_attempt_at timestamptz NULL`, {
      transaction,
    });
    await qi.sequelize.query(
      `CREATE INDEX report_mails_due ON report_mails (next_attempt_at) WHERE state IN ('failed', 'sending')`,
      { transaction },
    );
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP INDEX IF EXISTS report_mails_due`);
  await qi.sequelize.query(`ALTER TABLE report_mails DROP COLUMN IF EXISTS next_attempt_at`);
};
