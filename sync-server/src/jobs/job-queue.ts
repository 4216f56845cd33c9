// Background work shared by every server instance on one database, on pg-boss (its own schema `pgboss`):
//
// - Once across instances: each job has a queue with the `stately` policy (at most one run waiting and one
//   running), pg-boss's cron sends one run per matching minute however many instances keep the schedule, and a
//   worker takes a run with `FOR UPDATE SKIP LOCKED`, so two instances never run the same one.
// - At least once: a run whose instance died stays active until its expiry (`expireInSeconds`), then pg-boss fails
//   it and it is retried. Each job body is itself safe to run twice (reminders and report mails claim their rows;
//   the purge deletes what is due; staged uploads are processed under a lock), so a repeat never doubles an e-mail.
// - Retry with backoff: a failed run is retried FAILING_AFTER - 1 times after a growing, jittered wait (pg-boss's
//   retryBackoff: the n-th retry waits 2^(n-1) to 2^n times RETRY_DELAY_SECONDS). A run that fails every time ends `failed`, and a queue whose latest
//   finished run failed is counted on the admin's overview ("automatic task is not working") until one succeeds.
// - Graceful stop: `stop()` stops fetching and waits for the runs in progress.
import PgBoss from 'pg-boss';
import type { Sequelize } from 'sequelize';
import { QueryTypes } from 'sequelize';

export interface JobDefinition {
  name: string;
  /** When it runs: a cron line (pg-boss checks it each minute). */
  cron: string;
  /** How long one run may take before it counts as failed (and is retried): longer than a run can take. */
  expireInSeconds: number;
  run(): Promise<unknown>;
}

/** Runs in a row (the first and its retries) after which a job is shown to the admin as not working. */
export const FAILING_AFTER = 3;
/** The first retry waits this long to twice as long; each next one twice as long again. */
export const RETRY_DELAY_SECONDS = 60;
/** pg-boss's schema; the attention query reads its tables. */
const SCHEMA = 'pgboss';

export interface JobQueue {
  boss: PgBoss;
  /**
   * Asks for a run now. Instances asking in the same minute get one run between them (the same slot as a cron
   * run), and at most one run waits per job.
   */
  runSoon(name: string): Promise<string | null>;
  /** Stops fetching and waits for the runs in progress (up to `timeoutMs`). */
  stop(timeoutMs?: number): Promise<void>;
}

export async function startJobQueue(
  databaseUrl: string,
  jobs: readonly JobDefinition[],
  options: {
    pollMs: number;
    onError?: (job: string, error: unknown) => void;
    /** Keep each job's cron schedule (false in tests that send runs themselves). */
    schedule?: boolean;
  },
): Promise<JobQueue> {
  const boss = new PgBoss({
    connectionString: databaseUrl,
    schema: SCHEMA,
    application_name: 'fourpoint-jobs',
    // A few connections: the queue's own statements are short, and the job bodies use the server's pool.
    max: 4,
    schedule: options.schedule ?? true,
  });
  boss.on('error', (error) => options.onError?.('job-queue', error));
  await boss.start();
  for (const job of jobs) {
    const queue: PgBoss.Queue = {
      name: job.name,
      policy: 'stately',
      retryLimit: FAILING_AFTER - 1,
      retryDelay: RETRY_DELAY_SECONDS,
      retryBackoff: true,
      expireInSeconds: job.expireInSeconds,
    };
    // Idempotent across instances starting at once; the update keeps an existing queue's settings current.
    await createQueueRetryingDeadlocks(boss, job.name, queue);
    await boss.updateQueue(job.name, queue);
    await boss.work(job.name, { pollingIntervalSeconds: Math.max(0.5, options.pollMs / 1000) }, async () => {
      try {
        await job.run();
      } catch (error) {
        options.onError?.(job.name, error);
        throw error;
      }
    });
    if (options.schedule ?? true) await boss.schedule(job.name, job.cron);
  }
  return {
    boss,
    runSoon: (name) => boss.send(name, {}, { singletonKey: 'run-soon', singletonSeconds: 60 }),
    // Resolves once the runs in progress have finished (or the time is up: pg-boss then fails them for a retry).
    stop: (timeoutMs = 30_000) => boss.stop({ graceful: true, wait: true, timeout: timeoutMs }),
  };
}

/**
 * pg-boss makes a queue's partition in one statement; instances starting together can deadlock there (PostgreSQL
 * 40P01 aborts one of them). The queue is then being made by the other: try again.
 */
async function createQueueRetryingDeadlocks(boss: PgBoss, name: string, queue: PgBoss.Queue) {
  for (let attempt = 1; ; attempt++) {
    try {
      return await boss.createQueue(name, queue);
    } catch (error) {
      if ((error as { code?: string }).code !== '40P01' || attempt >= 5) throw error;
    }
  }
}

/**
 * Jobs whose latest finished run failed after all its retries (for the admin's overview; no clinic data). Zero
 * before pg-boss has ever started on this database.
 */
export async function failingJobCount(sequelize: Sequelize): Promise<number> {
  const [installed] = await sequelize.query<{ present: boolean }>(
    `SELECT to_regclass('${SCHEMA}.job') IS NOT NULL AND to_regclass('${SCHEMA}.archive') IS NOT NULL AS present`,
    { type: QueryTypes.SELECT },
  );
  if (!installed?.present) return 0;
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM (
       SELECT DISTINCT ON (name) name, state FROM (
         SELECT name, state::text, completed_on FROM ${SCHEMA}.job WHERE state IN ('completed', 'failed')
         UNION ALL
         SELECT name, state::text, completed_on FROM ${SCHEMA}.archive WHERE state IN ('completed', 'failed')
       ) finished
       WHERE name NOT LIKE '\\_\\_pgboss%'
       ORDER BY name, completed_on DESC
     ) latest
     WHERE state = 'failed'`,
    { type: QueryTypes.SELECT },
  );
  return row?.n ?? 0;
}
