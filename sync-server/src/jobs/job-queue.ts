// Recurring background work shared by every server instance on one database: each job runs once per due time
// across all instances, is retried with a growing wait when it fails, and is counted for the admin when it keeps
// failing. pg-boss (the well-known queue for this) is not among the project's packages, so this is the small part
// of it the server needs, on one table (scheduled_jobs):
//
// - Once across instances: an instance runs a job only after claiming its row in one committed statement
//   (`FOR UPDATE SKIP LOCKED`, so instances never wait on each other) that also moves `next_run_at` past the
//   present and sets a lease (`locked_until`). Another instance polling at the same moment finds it taken.
// - At least once: a claim whose instance died (no success or failure recorded) is taken again when its lease
//   ends. Each job body is itself safe to run twice (reminders and report mails claim their rows; the purge
//   deletes what is due), so an overrun lease costs a repeat, never a double e-mail.
// - Retry with backoff: a failure schedules the next try after 1, 2, 4... minutes (capped at the job's interval),
//   keeps the error, and counts consecutive failures; a success resets the count.
// - Graceful stop: `stop()` stops claiming and waits for the runs in progress.
import type { Sequelize } from 'sequelize';
import { QueryTypes } from 'sequelize';

export interface JobDefinition {
  name: string;
  /** Time between two successful runs. */
  intervalMs: number;
  /** How long a claim lasts before another instance may take the job again (longer than one run can take). */
  leaseMs: number;
  run(): Promise<unknown>;
}

/** Consecutive failures from which a job is shown to the admin as not working. */
export const FAILING_AFTER = 3;
const FIRST_RETRY_MS = 60 * 1000;

export interface JobQueue {
  /** Claims and runs whatever is due now (the poll loop calls this; tests may too). */
  runDue(): Promise<string[]>;
  stop(): Promise<void>;
}

export function startJobQueue(
  sequelize: Sequelize,
  jobs: readonly JobDefinition[],
  options: { instance: string; pollMs?: number; onError?: (job: string, error: unknown) => void },
): JobQueue {
  const byName = new Map(jobs.map((job) => [job.name, job]));
  const running = new Set<Promise<unknown>>();
  let stopped = false;

  const registered = sequelize.query(
    // A new job is due at once; an existing row keeps its schedule and history.
    `INSERT INTO scheduled_jobs (name) SELECT unnest(ARRAY[:names]::text[]) ON CONFLICT (name) DO NOTHING`,
    { replacements: { names: jobs.map((job) => job.name) } },
  );

  const claimOne = async (): Promise<JobDefinition | null> => {
    const rows = await sequelize.query<{ name: string }>(
      `UPDATE scheduled_jobs j
          SET locked_by = :instance,
              locked_until = now() + (:leases::jsonb ->> j.name)::int * interval '1 millisecond',
              last_started_at = now(),
              runs = runs + 1
        WHERE j.name = (
          SELECT name FROM scheduled_jobs
           WHERE name = ANY(ARRAY[:names]::text[]) AND next_run_at <= now()
             AND (locked_until IS NULL OR locked_until < now())
           ORDER BY next_run_at
           LIMIT 1
           FOR UPDATE SKIP LOCKED)
      RETURNING j.name`,
      {
        type: QueryTypes.SELECT,
        replacements: {
          instance: options.instance,
          names: jobs.map((job) => job.name),
          leases: JSON.stringify(Object.fromEntries(jobs.map((job) => [job.name, job.leaseMs]))),
        },
      },
    );
    return rows[0] ? byName.get(rows[0].name)! : null;
  };

  const runClaimed = async (job: JobDefinition) => {
    try {
      await job.run();
      await sequelize.query(
        `UPDATE scheduled_jobs SET failures = 0, last_error = NULL, last_succeeded_at = now(),
            locked_by = NULL, locked_until = NULL,
            next_run_at = now() + :intervalMs * interval '1 millisecond'
          WHERE name = :name`,
        { replacements: { name: job.name, intervalMs: job.intervalMs } },
      );
    } catch (error) {
      options.onError?.(job.name, error);
      const message = error instanceof Error ? error.message : String(error);
      // `failures` on the right is the count before this one: the waits are 1, 2, 4... minutes, capped.
      await sequelize.query(
        `UPDATE scheduled_jobs SET failures = failures + 1, last_error = :message,
            locked_by = NULL, locked_until = NULL,
            next_run_at = now()
              + LEAST(:intervalMs, :firstRetryMs * power(2, failures)) * interval '1 millisecond'
          WHERE name = :name`,
        {
          replacements: {
            name: job.name,
            message: message.slice(0, 2000),
            intervalMs: job.intervalMs,
            firstRetryMs: FIRST_RETRY_MS,
          },
        },
      );
    }
  };

  const pollOnce = async (): Promise<string[]> => {
    await registered;
    const ran: string[] = [];
    for (;;) {
      if (stopped) return ran;
      const job = await claimOne();
      if (!job) return ran;
      const run = runClaimed(job);
      running.add(run);
      await run.finally(() => running.delete(run));
      ran.push(job.name);
    }
  };

  // One poll at a time per instance: a poll asked for while another runs starts when it ends.
  let polling: Promise<unknown> = Promise.resolve();
  let queuedPolls = 0;
  const runDue = (): Promise<string[]> => {
    queuedPolls += 1;
    const next = polling.then(pollOnce).finally(() => (queuedPolls -= 1));
    polling = next.catch((error: unknown) => options.onError?.('job-queue', error));
    return next;
  };
  void runDue().catch(() => undefined);
  // The timer skips a beat while a poll is still going (a long job), rather than queueing polls behind it.
  const timer = setInterval(() => {
    if (queuedPolls === 0) void runDue().catch(() => undefined);
  }, options.pollMs ?? 30_000);
  timer.unref();

  return {
    runDue,
    async stop() {
      stopped = true;
      clearInterval(timer);
      await polling;
      await Promise.allSettled([...running]);
    },
  };
}

/** Jobs that have failed FAILING_AFTER times in a row (for the admin's overview; no clinic data). */
export async function failingJobCount(sequelize: Sequelize): Promise<number> {
  const [row] = await sequelize.query<{ n: string }>(
    'SELECT count(*) AS n FROM scheduled_jobs WHERE failures >= :failingAfter',
    { type: QueryTypes.SELECT, replacements: { failingAfter: FAILING_AFTER } },
  );
  return Number(row?.n ?? 0);
}
