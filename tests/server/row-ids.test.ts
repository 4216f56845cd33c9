// Every route of the access table that names a row in its path gives one answer for a name no row can have (400,
// `malformed_id`, in words a person can act on) and one for a well-formed name that no row carries (404), whatever
// the row. OWASP ASVS 4.0.3 V5.1.3 (input is validated, positively, before use) and V7.4.1 (a generic message
// that shows no internals).
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type { Role } from '@/shared/protocol';
import { accessTable, type RouteSpec } from '@/sync-server/src/routes/access-table';
import { rowIdParams } from '@/sync-server/src/routes/row-ids';
import { startPracticeFakes, type PracticeFakes } from './helpers/practice-fakes';
import { makeClinic, makeTestContext, tokensFor } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let tokens: Record<Role, string>;

/** A valid body for each route that takes one, so an unknown row, not the body, decides the answer. */
const bodies: Record<string, object> = {
  'post /api/admin/conflicts/:id/resolve': { keep: 'client', note: 'Row id check' },
  'put /api/review/sessions/:sessionId/notes': {
    findings: 'x',
    plan: null,
    followUpDate: null,
    baseVersion: 1,
  },
  'put /api/review/sessions/:sessionId/referral-flag': { flagged: true, note: 'Row id check' },
  'post /api/review/sessions/:sessionId/report-mails': { to: 'someone@clinic.fourpoint.test' },
  'patch /api/team/users/:id': { disabled: true },
  'patch /api/client-records/:id': { firstName: 'X', lastName: 'Y', version: 1 },
  'post /api/client-records/:id/erase': { confirmName: 'X Y' },
};
/** Values for the path parameters that do not name a row. */
const otherParams: Record<string, string> = { site: 'mitral', index: '0' };

const rowRoutes = accessTable.filter((r) => rowIdParams(r.path, r.opaqueParams).length > 0);
const key = (route: RouteSpec) => `${route.method} ${route.path}`;

function pathWith(route: RouteSpec, rowId: () => string): string {
  const rows = new Set(rowIdParams(route.path, route.opaqueParams).map((p) => p.name));
  return route.path.replace(/:(\w+)/g, (_, name: string) => (rows.has(name) ? rowId() : otherParams[name]));
}

async function ask(route: RouteSpec, path: string) {
  const role = route.access === 'public' ? null : route.access[0];
  let req = request(ctx.app)[route.method](path);
  if (role) req = req.set('authorization', `Bearer ${tokens[role]}`);
  const body = bodies[key(route)];
  return body ? req.send(body) : req;
}

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  tokens = await tokensFor(ctx.app, await makeClinic('Row ids'));
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

test('the access table has routes that name rows, every path parameter of them is known, and every body is given', () => {
  expect(rowRoutes.length).toBeGreaterThan(15);
  for (const route of rowRoutes) {
    for (const [, name] of route.path.matchAll(/:(\w+)/g)) {
      const isRow = rowIdParams(route.path, route.opaqueParams).some((p) => p.name === name);
      expect({ route: key(route), name, known: isRow || name in otherParams }).toMatchObject({ known: true });
    }
    if (
      route.method === 'put' ||
      route.method === 'patch' ||
      (route.method === 'post' && !/retry|refund/.test(route.path))
    )
      expect({ route: key(route), hasBody: key(route) in bodies }).toMatchObject({ hasBody: true });
  }
});

describe.each(rowRoutes.map((route) => [key(route), route] as const))('%s', (_name, route) => {
  test('when the path names a row in a form no row has, then it is a 400 that says so in words', async () => {
    const res = await ask(
      route,
      pathWith(route, () => 'not-a-row'),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_id');
    expect(res.body.error.message).toMatch(
      /^This link does not lead to an? [a-z -]+: it is incomplete or mistyped\./,
    );
  });

  test('when the path names a row that does not exist, then it is a 404', async () => {
    const res = await ask(route, pathWith(route, randomUUID));
    expect({ status: res.status, body: res.body }).toMatchObject({ status: 404 });
    expect(typeof res.body.error.message).toBe('string');
  });
});
