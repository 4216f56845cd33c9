import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The recurring background work moved to pg-boss (its own schema `pgboss`, installed by pg-boss itself when the
// first instance starts; see sync-server/src/jobs/job-queue.ts): the home-made queue's table goes.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP TABLE IF EXISTS scheduled_jobs`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
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
