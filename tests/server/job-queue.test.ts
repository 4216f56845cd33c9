// The job queue shared by server instances (sync-server/src/jobs/job-queue.ts, on pg-boss): three queues with
// their own connections stand for three instances. A run they all ask for runs once across them; a failing one
// is retried after a growing wait and, once it has failed three times in a row, is counted on the admin's
// overview until a run succeeds; stopping waits for the run in progress.
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import {
  FAILING_AFTER,
  RETRY_DELAY_SECONDS,
  startJobQueue,
  type JobDefinition,
  type JobQueue,
} from '@/sync-server/src/jobs/job-queue';
import { databaseUrl, makeClinic, makeTestContext, tokensFor, type TestContext } from './helpers/test-app';

jest.setTimeout(120_000);
let ctx: TestContext;
const started: JobQueue[] = [];

beforeAll(() => {
  ctx = makeTestContext();
});
afterAll(async () => {
  await Promise.all(started.map((queue) => queue.stop()));
  await ctx.close();
});

const start = async (job: JobDefinition) => {
  // The cron schedule stays off: these tests ask for each run themselves.
  const queue = await startJobQueue(databaseUrl(), [job], { pollMs: 500, schedule: false });
  started.push(queue);
  return queue;
};
const stop = async (queue: JobQueue) => {
  started.splice(started.indexOf(queue), 1);
  await queue.stop();
};

const jobDefinition = (label: string, run: () => Promise<unknown>): JobDefinition => ({
  name: `test-${label}-${randomUUID()}`,
  cron: '0 0 1 1 *',
  expireInSeconds: 60,
  run,
});

type JobRow = { id: string; state: string; retry_count: number; wait_ms: number; output: string | null };
const jobsOf = (name: string) =>
  ctx.sequelize.query<JobRow>(
    `SELECT id, state::text, retry_count, output::text,
            (extract(epoch FROM start_after - now()) * 1000)::float8 AS wait_ms
       FROM pgboss.job WHERE name = :name ORDER BY created_on`,
    { type: QueryTypes.SELECT, replacements: { name } },
  );

/** Waits (bounded by the test's timeout) until the job's runs satisfy `done`. */
async function until(name: string, done: (rows: JobRow[]) => boolean): Promise<JobRow[]> {
  for (;;) {
    const rows = await jobsOf(name);
    if (done(rows)) return rows;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

test('when three instances ask for the same run at the same moment, then it runs once', async () => {
  let runs = 0;
  const job = jobDefinition('once', async () => {
    runs += 1;
    // Long enough for the other instances' workers to poll while it runs.
    await new Promise((resolve) => setTimeout(resolve, 1500));
  });
  const queues = await Promise.all([start(job), start(job), start(job)]);
  const asked = await Promise.all(queues.map((queue) => queue.runSoon(job.name)));
  expect(asked.filter((id) => id !== null)).toHaveLength(1);
  await until(job.name, (rows) => rows.length > 0 && rows.every((row) => row.state === 'completed'));
  await Promise.all(queues.map(stop));
  expect(runs).toBe(1);
  expect(await jobsOf(job.name)).toHaveLength(1);
});

test('when a job keeps failing, then each retry waits longer and after three failures the admin sees it until a run succeeds', async () => {
  const clinic = await makeClinic('Jobs');
  const tokens = await tokensFor(ctx.app, clinic);
  const failing = async () =>
    (
      await request(ctx.app)
        .get('/api/admin/attention')
        .set('authorization', `Bearer ${tokens.admin}`)
        .expect(200)
    ).body.failingBackgroundTasks as number;
  const before = await failing();

  const job = jobDefinition('failing', async () => {
    throw new Error('the mail relay did not answer');
  });
  const queue = await start(job);
  const id = await queue.runSoon(job.name);
  const waits: number[] = [];
  for (let attempt = 1; attempt < FAILING_AFTER; attempt++) {
    const [row] = await until(job.name, ([r]) => r?.state === 'retry' && r.retry_count === attempt - 1);
    waits.push(row.wait_ms);
    // Due now, as if the wait had passed.
    await ctx.sequelize.query('UPDATE pgboss.job SET start_after = now() WHERE id = :id', {
      replacements: { id },
    });
    await until(job.name, ([r]) => r?.retry_count === attempt);
  }
  const [last] = await until(job.name, ([r]) => r?.state === 'failed');
  expect(last.retry_count).toBe(FAILING_AFTER - 1);
  expect(last.output).toContain('the mail relay did not answer');
  // pg-boss's backoff: the n-th retry waits 2^(n-1) to 2^n times the delay (random in between), so each wait is
  // longer than the one before (a few seconds allowed for the time this test took to read it).
  const delayMs = RETRY_DELAY_SECONDS * 1000;
  expect(waits[0]).toBeGreaterThan(delayMs - 5_000);
  expect(waits[0]).toBeLessThanOrEqual(2 * delayMs);
  expect(waits[1]).toBeGreaterThan(2 * delayMs - 5_000);
  expect(waits[1]).toBeLessThanOrEqual(4 * delayMs);
  expect(await failing()).toBe(before + 1);
  await stop(queue);

  // Another instance's successful run clears it.
  const recovered = await start({ ...job, run: async () => undefined });
  const next = await recovered.boss.send(job.name, {});
  await until(job.name, (rows) => rows.some((row) => row.id === next && row.state === 'completed'));
  expect(await failing()).toBe(before);
});

test('when an instance stops while a run is in progress, then the stop waits for it to finish', async () => {
  let finished = false;
  let begun!: () => void;
  const running = new Promise<void>((resolve) => (begun = resolve));
  const job = jobDefinition('graceful', async () => {
    begun();
    await new Promise((resolve) => setTimeout(resolve, 1000));
    finished = true;
  });
  const queue = await start(job);
  await queue.runSoon(job.name);
  await running;
  await stop(queue);
  expect(finished).toBe(true);
  const [row] = await jobsOf(job.name);
  expect(row.state).toBe('completed');
});
