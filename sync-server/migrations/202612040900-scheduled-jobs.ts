import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// scheduled_jobs: the server's recurring background work (reminders, report-mail retries, the purge), one row per
// job, shared by every instance on the database. An instance runs a job only after claiming its row (a lease in
// `locked_until`), so each run happens once across all instances; see sync-server/src/jobs/job-queue.ts.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`CREATE TABLE scheduled_jobs (
    name text PRIMARY KEY,
    next_run_at timestamptz NOT NULL DEFAULT now(),
    locked_by text NULL,
    locked_until timestamptz NULL,
    failures integer NOT NULL DEFAULT 0,
    last_error text NULL,
    last_started_at timestamptz NULL,
    last_succeeded_at timestamptz NULL,
    runs bigint NOT NULL DEFAULT 0
  )`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP TABLE IF EXISTS scheduled_jobs`);
};
