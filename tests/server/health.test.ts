import request from 'supertest';
import { healthResponseSchema } from '@/shared/protocol';
import { makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

describe('GET /api/health', () => {
  test('when the database answers SELECT 1, then it is 200 with db up', async () => {
    const res = await request(ctx.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true, db: 'up' });
    expect(healthResponseSchema.parse(res.body)).toEqual(res.body);
  });
});
