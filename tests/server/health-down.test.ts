import net from 'node:net';
import pino from 'pino';
import request from 'supertest';
import { createApp } from '@/sync-server/src/app';
import { readinessProbeFor } from '@/sync-server/src/composition-root';
import { createSequelize } from '@/sync-server/src/db/database';

// Its own file: the audit log writes to one database per module registry (useAuditDatabase), and this one points
// nowhere.
async function closedPort(): Promise<number> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

describe('GET /api/health with no database', () => {
  test('when nothing listens where the database should be, then it is 503 with db down', async () => {
    const sequelize = createSequelize(`postgres://fourpoint@127.0.0.1:${await closedPort()}/nowhere`);
    const app = createApp({ sequelize, jwtSecret: 'unused', logger: pino({ level: 'silent' }) });
    try {
      const res = await request(app).get('/api/health');
      expect(res.status).toBe(503);
      expect(res.body).toEqual({ ok: false, db: 'down' });
    } finally {
      await sequelize.close();
    }
  });

  test('when a route that reads the database is called, then it is 503 with Retry-After and a plain message', async () => {
    // RFC 9110 10.2.3: Retry-After with a 503 says how long the service is expected to be unavailable.
    const sequelize = createSequelize(`postgres://fourpoint@127.0.0.1:${await closedPort()}/nowhere`);
    const app = createApp({ sequelize, jwtSecret: 'unused', logger: pino({ level: 'silent' }) });
    try {
      const res = await request(app)
        .post('/api/auth/sign-in')
        .send({ email: 'someone@example.test', password: 'a password' });
      expect(res.status).toBe(503);
      expect(res.headers['retry-after']).toBe('30');
      expect(res.headers['cache-control']).toBe('no-store');
      expect(res.body).toEqual({
        error: {
          code: 'database_unavailable',
          message:
            "The clinic's database cannot be reached just now. Nothing was changed; try again in 30 seconds.",
        },
      });
    } finally {
      await sequelize.close();
    }
  });

  test('when nothing listens where the database should be, then readiness is 503 with db down', async () => {
    // What takes the instance out of the load balancer (scripts/bootstrap/balancer.mjs checks this route).
    const sequelize = createSequelize(`postgres://fourpoint@127.0.0.1:${await closedPort()}/nowhere`);
    const app = createApp({ sequelize, jwtSecret: 'unused', logger: pino({ level: 'silent' }) });
    try {
      const res = await request(app).get('/api/health/ready');
      expect(res.status).toBe(503);
      expect(res.body).toEqual({ ok: false, db: 'down', storage: 'up', stopping: false });
    } finally {
      await readinessProbeFor(sequelize).stop();
      await sequelize.close();
    }
  });
});
