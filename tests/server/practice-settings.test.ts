import request from 'supertest';
import type { ClinicRange } from '@/shared/protocol/practice';
import { DEFAULT_RANGES } from '@/shared/ranges';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
let tokens: Record<'operator' | 'practitioner' | 'admin', string>;

beforeAll(async () => {
  clinic = await makeClinic('Settings');
  tokens = await tokensFor(ctx.app, clinic);
});
afterAll(async () => {
  await ctx.close();
});

const ranges = async (token: string) => {
  const res = await request(ctx.app).get('/api/settings/ranges').set('authorization', `Bearer ${token}`);
  expect(res.status).toBe(200);
  return res.body.ranges as ClinicRange[];
};
const find = (list: ClinicRange[], metric: string, site: string) =>
  list.find((r) => r.metric === metric && r.site === site)!;

describe('clinic reference ranges', () => {
  test('when a clinic has set nothing, then every measurement has a default at each of the four sites with its source', async () => {
    const list = await ranges(tokens.practitioner);
    const metrics = Object.keys(DEFAULT_RANGES);
    expect(list).toHaveLength(metrics.length * 4);
    // Adult resting heart rate 60–100 bpm: the default that shared/ranges cites (American Heart Association
    // public guidance, from memory there).
    const rate = find(list, 'heartRateBpm', 'aortic');
    expect(rate).toMatchObject({ low: 60, high: 100, unit: 'bpm', label: 'Heart rate', overridden: false });
    expect(rate.source).toBe(DEFAULT_RANGES.heartRateBpm.aortic.source);
    // S1 louder than S2 at the apex, S2 louder at the base (shared/ranges, Bates' Guide from memory).
    expect(find(list, 's1s2PeakRatio', 'mitral').low).toBe(1);
    expect(find(list, 's1s2PeakRatio', 'pulmonic').high).toBe(1);
  });

  test('when the admin sets a range at one site and resets it, then only that site changes and the default returns', async () => {
    const own = await makeClinic('Settings own');
    const admin = (await tokensFor(ctx.app, own)).admin;
    const set = await request(ctx.app)
      .put('/api/settings/ranges/heartRateBpm/mitral')
      .set('authorization', `Bearer ${admin}`)
      .send({ low: 55, high: 95 });
    expect(set.status).toBe(200);
    expect(find(set.body.ranges, 'heartRateBpm', 'mitral')).toMatchObject({
      low: 55,
      high: 95,
      overridden: true,
    });
    expect(find(set.body.ranges, 'heartRateBpm', 'tricuspid')).toMatchObject({
      low: 60,
      high: 100,
      overridden: false,
    });

    const reset = await request(ctx.app)
      .delete('/api/settings/ranges/heartRateBpm/mitral')
      .set('authorization', `Bearer ${admin}`);
    expect(reset.status).toBe(200);
    expect(find(reset.body.ranges, 'heartRateBpm', 'mitral')).toMatchObject({
      low: 60,
      high: 100,
      overridden: false,
    });
  });

  test('when a range has its low end above its high end, then it is refused with a message and nothing changes', async () => {
    const res = await request(ctx.app)
      .put('/api/settings/ranges/heartRateBpm/mitral')
      .set('authorization', `Bearer ${tokens.admin}`)
      .send({ low: 120, high: 80 });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toMatch(/low end must not be above the high end/);
    expect(find(await ranges(tokens.admin), 'heartRateBpm', 'mitral').overridden).toBe(false);
  });

  test('when a metric has no default, then setting it is refused as unknown', async () => {
    const res = await request(ctx.app)
      .put('/api/settings/ranges/bloodPressure/mitral')
      .set('authorization', `Bearer ${tokens.admin}`)
      .send({ low: 1, high: 2 });
    expect(res.status).toBe(404);
  });
});
