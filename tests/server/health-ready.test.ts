// Readiness, as the load balancer asks for it (GET /api/health/ready; HAProxy's check in
// scripts/bootstrap/balancer.mjs). It must tell a working instance from one that cannot serve, and a busy request
// pool must not make a working instance look down: the route answers from a probe on a connection of its own.
import request from 'supertest';
import { readinessResponseSchema } from '@/shared/protocol';
import { makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

test('when the database and the blob store answer, then readiness is 200 with both up', async () => {
  const res = await request(ctx.app).get('/api/health/ready');
  expect(res.status).toBe(200);
  expect(readinessResponseSchema.parse(res.body)).toEqual({
    ok: true,
    db: 'up',
    storage: 'up',
    stopping: false,
  });
});

test('when every pooled connection is busy, then readiness still answers 200 without waiting for one', async () => {
  const poolSize = ctx.sequelize.config.pool!.max;
  let release!: () => void;
  const released = new Promise<void>((resolve) => (release = resolve));
  let holding = 0;
  let allHeld!: () => void;
  const held = new Promise<void>((resolve) => (allHeld = resolve));
  // Each transaction keeps its connection until the readiness answer is in.
  const transactions = Array.from({ length: poolSize }, () =>
    ctx.sequelize.transaction(async (transaction) => {
      await ctx.sequelize.query('SELECT 1', { transaction });
      if (++holding === poolSize) allHeld();
      await released;
    }),
  );
  await held;
  try {
    // A check through the request pool would wait here until the pool's acquire timeout and then say 'down'.
    const res = await request(ctx.app).get('/api/health/ready');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ db: 'up', storage: 'up' });
  } finally {
    release();
    await Promise.all(transactions);
  }
});
