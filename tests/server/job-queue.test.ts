// The job queue shared by server instances (sync-server/src/jobs/job-queue.ts): three queues on three connections
// stand for three instances. A due job runs once across them; a failing one is retried later with a growing wait
// and, once it has failed three times in a row, is counted on the admin's overview.
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { createSequelize } from '@/sync-server/src/db/database';
import { FAILING_AFTER, startJobQueue, type JobDefinition } from '@/sync-server/src/jobs/job-queue';
import { databaseUrl, makeClinic, makeTestContext, tokensFor, type TestContext } from './helpers/test-app';

const HOUR = 60 * 60 * 1000;
let ctx: TestContext;
const connections: Sequelize[] = [];
const names: string[] = [];

beforeAll(() => {
  ctx = makeTestContext();
  for (let i = 0; i < 3; i++) connections.push(createSequelize(databaseUrl(), { poolMax: 2 }));
});
afterAll(async () => {
  await ctx.sequelize.query('DELETE FROM scheduled_jobs WHERE name = ANY(ARRAY[:names]::text[])', {
    replacements: { names },
  });
  await Promise.all(connections.map((c) => c.close()));
  await ctx.close();
});

const jobName = (label: string) => {
  const name = `test-${label}-${randomUUID()}`;
  names.push(name);
  return name;
};

const row = async (name: string) =>
  (
    await ctx.sequelize.query<{ failures: number; runs: string; last_error: string | null; wait_ms: number }>(
      `SELECT failures, runs, last_error,
              (extract(epoch FROM next_run_at - now()) * 1000)::float8 AS wait_ms
         FROM scheduled_jobs WHERE name = :name`,
      { type: QueryTypes.SELECT, replacements: { name } },
    )
  )[0];

test('when three instances poll a due job at the same moment, then it runs once', async () => {
  let runs = 0;
  const job: JobDefinition = {
    name: jobName('once'),
    intervalMs: HOUR,
    leaseMs: HOUR,
    run: async () => {
      runs += 1;
      // Long enough for the other instances' polls to meet the claimed row.
      await new Promise((resolve) => setTimeout(resolve, 200));
    },
  };
  const queues = connections.map((c, i) => startJobQueue(c, [job], { instance: `i${i + 1}`, pollMs: HOUR }));
  await Promise.all(queues.map((q) => q.runDue()));
  await Promise.all(queues.map((q) => q.stop()));
  expect(runs).toBe(1);
  const after = await row(job.name);
  expect(Number(after.runs)).toBe(1);
  // The next run is an interval away, not now.
  expect(after.wait_ms).toBeGreaterThan(HOUR - 60_000);
});

test('when a job keeps failing, then each retry waits longer and after three failures the admin sees it', async () => {
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

  const job: JobDefinition = {
    name: jobName('failing'),
    intervalMs: HOUR,
    leaseMs: HOUR,
    run: async () => {
      throw new Error('the mail relay did not answer');
    },
  };
  const queue = startJobQueue(connections[0], [job], { instance: 'i1', pollMs: HOUR });
  // A new job is due at once: the queue's first poll runs it (and this waits for that poll).
  await queue.runDue();
  const waits: number[] = [(await row(job.name)).wait_ms];
  for (let i = 1; i < FAILING_AFTER; i++) {
    // Due now, as if the wait had passed.
    await ctx.sequelize.query('UPDATE scheduled_jobs SET next_run_at = now() WHERE name = :name', {
      replacements: { name: job.name },
    });
    await queue.runDue();
    waits.push((await row(job.name)).wait_ms);
  }
  await queue.stop();
  const after = await row(job.name);
  expect(after.failures).toBe(FAILING_AFTER);
  expect(after.last_error).toBe('the mail relay did not answer');
  // About 1, 2 and 4 minutes.
  expect(waits[0]).toBeGreaterThan(50_000);
  expect(waits[1]).toBeGreaterThan(waits[0] * 1.8);
  expect(waits[2]).toBeGreaterThan(waits[1] * 1.8);
  expect(await failing()).toBe(before + 1);

  // One success clears it.
  const recovered = startJobQueue(connections[1], [{ ...job, run: async () => undefined }], {
    instance: 'i2',
    pollMs: HOUR,
  });
  await ctx.sequelize.query('UPDATE scheduled_jobs SET next_run_at = now() WHERE name = :name', {
    replacements: { name: job.name },
  });
  await recovered.runDue();
  await recovered.stop();
  expect((await row(job.name)).failures).toBe(0);
  expect(await failing()).toBe(before);
});
