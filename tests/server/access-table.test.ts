import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { roles, type Role } from '@/shared/protocol';
import { accessTable, type RouteSpec } from '@/sync-server/src/routes/access-table';
import { undeclaredRoutes } from './helpers/router-stack';
import { makeClinic, makeSiblingApp, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
let tokens: Record<Role, string>;

beforeAll(async () => {
  clinic = await makeClinic('Access');
  tokens = await tokensFor(ctx.app, clinic);
});
afterAll(() => ctx.close());

const concretePath = (route: RouteSpec) => route.path.replace(/:[A-Za-z]+/g, () => randomUUID());

function send(route: RouteSpec, token?: string) {
  const req = request(ctx.app)[route.method](concretePath(route));
  if (token) req.set('authorization', `Bearer ${token}`);
  return route.method === 'get' || route.method === 'delete' ? req : req.send({});
}

// An allowed caller may still be refused for a bad or empty body, but never for who they are.
const expectAllowed = (status: number) => {
  expect([401, 403]).not.toContain(status);
  expect(status).toBeLessThan(500);
};

describe.each(accessTable.map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))(
  '%s',
  (_name, route) => {
    test('when no token is sent, then the answer matches the table', async () => {
      const res = await send(route);
      if (route.access === 'public') expectAllowed(res.status);
      else {
        expect(res.status).toBe(401);
        expect(res.body.error.code).toBe('unauthenticated');
      }
    });

    test.each(roles.map((role) => [role]))(
      'when a(n) %s calls it, then the answer matches the table',
      async (role) => {
        const res = await send(route, tokens[role]);
        if (route.access === 'public' || route.access.includes(role)) expectAllowed(res.status);
        else {
          expect(res.status).toBe(403);
          expect(res.body.error).toEqual({ code: 'forbidden', message: 'Your role does not allow this.' });
        }
      },
    );
  },
);

describe('the router and the table', () => {
  const webDist = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-web-'));
  fs.writeFileSync(path.join(webDist, 'index.html'), '<!doctype html><title>t</title>');

  test('when the app is built, then every route Express holds is declared in the access table', () => {
    expect(undeclaredRoutes(makeSiblingApp(ctx, { webDist }), accessTable)).toEqual([]);
  });

  test('when a route is added behind the table, then the check names it', () => {
    const app = makeSiblingApp(ctx);
    app.get('/api/secret-report', (_req, res) => res.json({}));
    expect(undeclaredRoutes(app, accessTable)).toEqual(['get /api/secret-report']);
  });

  test('when the table is read, then no method and path is declared twice and every role list is non-empty', () => {
    const keys = accessTable.map((r) => `${r.method} ${r.path}`);
    expect(new Set(keys).size).toBe(keys.length);
    for (const r of accessTable) if (r.access !== 'public') expect(r.access.length).toBeGreaterThan(0);
  });

  // The service worker (scripts/build-pwa.mjs) answers navigations with the cached app unless the path is one
  // of these; a server page outside them would show the app's "not found" to a browser with the app installed.
  test('when a route is in the table, then its path is one the service worker leaves to the server', () => {
    const serverPaths = JSON.parse(
      fs.readFileSync(path.resolve(__dirname, '../../shared/web/server-paths.json'), 'utf8'),
    ) as string[];
    const outside = accessTable.filter((r) => !serverPaths.some((prefix) => r.path.startsWith(prefix)));
    expect(outside.map((r) => `${r.method} ${r.path}`)).toEqual([]);
  });

  test('when an /api path is not in the table, then it is a 404 JSON answer', async () => {
    const res = await request(ctx.app)
      .get('/api/no-such-thing')
      .set('authorization', `Bearer ${tokens.admin}`);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
    const wrongMethod = await request(ctx.app).delete('/api/health');
    expect(wrongMethod.status).toBe(404);
  });
});
