// Each class of bad request the probe turned into a 500, answered instead with a 4xx a person can act on.
// Sources: OWASP ASVS 4.0.3 V5.1.3 (input is validated against an allow list of values and forms), V5.1.4
// (structured data, dates included, is checked against a schema), V12.3.1 (user-submitted file names and
// paths are normalised before use), V8.2.1 (sensitive data is not cached); the calendar rules are ISO 8601 /
// RFC 3339 section 5.7 (2026 is not a leap year; no month has 45 days); percent-encoding is RFC 3986 2.1.
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION, type Role } from '@/shared/protocol';
import { accessTable } from '@/sync-server/src/routes/access-table';
import { insertClient } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
let tokens: Record<Role, string>;
let clientId: string;

beforeAll(async () => {
  clinic = await makeClinic('BadRequests');
  tokens = await tokensFor(ctx.app, clinic);
  clientId = await insertClient(ctx.sequelize, clinic.id);
});
afterAll(() => ctx.close());

const as = (role: Role) => ({ authorization: `Bearer ${tokens[role]}` });

describe('calendar-invalid dates', () => {
  test.each(['2026-02-31', '2026-13-45', '2025-02-29', '0000-01-01'])(
    'when a client record is created with date of birth %s, then it is a 400 that asks for a real date',
    async (day) => {
      const res = await request(ctx.app)
        .post('/api/client-records')
        .set(as('admin'))
        .send({ firstName: 'Ines', lastName: 'Marlowe', dateOfBirth: day });
      expect(res.status).toBe(400);
      expect(res.body.error.message).toMatch(/dateOfBirth: Use a real date written like 2026-03-31\./);
    },
  );

  test('when a leap day of a leap year is sent, then it is accepted (2024 is a leap year)', async () => {
    const res = await request(ctx.app)
      .post('/api/client-records')
      .set(as('admin'))
      .send({ firstName: 'Ines', lastName: 'Leapday', dateOfBirth: '2024-02-29' });
    expect(res.status).toBeLessThan(300);
  });

  test('when the audit and review filters get 2026-02-31, then each is a 400 naming the filter', async () => {
    const audit = await request(ctx.app).get('/api/audit?from=2026-02-31').set(as('admin'));
    expect(audit.status).toBe(400);
    expect(audit.body.error.message).toMatch(/^from: Use a real date/);
    const review = await request(ctx.app).get('/api/review/sessions?to=2026-13-45').set(as('practitioner'));
    expect(review.status).toBe(400);
    expect(review.body.error.message).toMatch(/^to: Use a real date/);
  });

  test('when review notes carry a follow-up on 2026-02-31, then it is a 400 naming followUpDate', async () => {
    const res = await request(ctx.app)
      .put(`/api/review/sessions/${randomUUID()}/notes`)
      .set(as('practitioner'))
      .send({ findings: null, plan: null, followUpDate: '2026-02-31', baseVersion: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^followUpDate: Use a real date/);
  });
});

describe('malformed percent-encoding in a path', () => {
  test.each(['/api/client-records/%zz', '/api/review/sessions/%E0%A4%A', '/api/admin/conflicts/%'])(
    'when %s is asked for, then it is a 400 that says how to write a %%',
    async (path) => {
      const res = await request(ctx.app).get(path).set(as('admin'));
      expect(res.status).toBe(400);
      expect(res.body.error).toEqual({
        code: 'malformed_path',
        message: 'The address has a % that is not followed by two hex digits; encode it as %25.',
      });
    },
  );
});

describe('review list cursors', () => {
  const cursorOf = (fields: Record<string, unknown>) =>
    Buffer.from(JSON.stringify(fields)).toString('base64url');

  test.each([
    ['a sort value that is not a time', { s: 'startedAt', d: 'desc', v: 'yesterday', id: randomUUID() }],
    [
      'a day that does not exist',
      { s: 'startedAt', d: 'desc', v: '2026-02-31 10:00:00+00', id: randomUUID() },
    ],
    ['an id that is not a UUID', { s: 'startedAt', d: 'desc', v: '2026-03-01 10:00:00+00', id: '1 OR 1=1' }],
    ['a NUL in the value', { s: 'clientName', d: 'asc', v: 'a\u0000b', id: randomUUID() }],
    [
      'a field the server never writes',
      { s: 'startedAt', d: 'desc', v: '2026-03-01 10:00:00+00', id: randomUUID(), x: 1 },
    ],
    ['a number where text belongs', { s: 'status', d: 'asc', v: 42, id: randomUUID() }],
  ])('when the cursor has %s, then it is a 400 bad_cursor', async (_what, fields) => {
    const sort = String(fields.s);
    const res = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ sort, dir: fields.d, cursor: cursorOf(fields) })
      .set(as('practitioner'));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_cursor');
    expect(res.body.error.message).toMatch(/start again from the first page/);
  });

  test('when the cursor is one the server could have written, then the page is served', async () => {
    const res = await request(ctx.app)
      .get('/api/review/sessions')
      .query({
        cursor: cursorOf({ s: 'startedAt', d: 'desc', v: '2026-03-01 10:00:00.5+00', id: randomUUID() }),
      })
      .set(as('practitioner'));
    expect(res.status).toBe(200);
  });
});

describe('field names of a sync change', () => {
  async function pushChange(change: string) {
    // Raw JSON, so `__proto__` arrives as an own key as it would from any client.
    const body = `{"protocolVersion":${SYNC_PROTOCOL_VERSION},"deviceId":"${randomUUID()}","mutations":[{"mutationId":"${randomUUID()}","entity":"clients","id":"${randomUUID()}","baseVersion":0,"change":${change}}]}`;
    return request(ctx.app)
      .post('/api/sync/push')
      .set(as('operator'))
      .set(SYNC_PROTOCOL_HEADER, String(SYNC_PROTOCOL_VERSION))
      .set('content-type', 'application/json')
      .send(body);
  }

  test.each(['constructor', '__proto__', 'toString', 'hasOwnProperty'])(
    'when a change names the field %s, then that mutation is refused as an unknown field',
    async (name) => {
      const res = await pushChange(`{"firstName":"Ada","lastName":"Quill","${name}":{"polluted":true}}`);
      expect(res.status).toBe(200);
      expect(res.body.results).toEqual([
        expect.objectContaining({
          status: 'rejected',
          code: 'invalid_change',
          reason: `clients has no field ${name}.`,
        }),
      ]);
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    },
  );

  test('when a change is not an object, then the push is a 400 that says what a change is', async () => {
    const res = await pushChange('["firstName"]');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/A change is an object of field names and values\./);
  });
});

describe('NUL characters', () => {
  test('when a body field holds a NUL, then it is a 400 naming the field and nothing is stored', async () => {
    const res = await request(ctx.app)
      .post('/api/client-records')
      .set(as('admin'))
      .send({ firstName: 'Nul\u0000Byte', lastName: 'Carrier' });
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({
      code: 'nul_character',
      message:
        'The text in body.firstName contains a NUL character (\\0), which cannot be stored. Remove it and send again.',
    });
    const [rows] = await ctx.sequelize.query(
      `SELECT 1 FROM clients WHERE clinic_id = :id AND last_name = 'Carrier'`,
      {
        replacements: { id: clinic.id },
      },
    );
    expect(rows).toHaveLength(0);
  });

  test('when a nested sync change or a query holds a NUL, then each is a 400 naming where', async () => {
    const push = await request(ctx.app)
      .post('/api/sync/push')
      .set(as('operator'))
      .set(SYNC_PROTOCOL_HEADER, String(SYNC_PROTOCOL_VERSION))
      .send({
        protocolVersion: SYNC_PROTOCOL_VERSION,
        deviceId: randomUUID(),
        mutations: [
          {
            mutationId: randomUUID(),
            entity: 'clients',
            id: randomUUID(),
            baseVersion: 0,
            change: { notes: 'a\u0000' },
          },
        ],
      });
    expect(push.status).toBe(400);
    expect(push.body.error.message).toMatch(/^The text in body\.mutations\.0\.change\.notes contains a NUL/);
    const query = await request(ctx.app).get('/api/client-records?q=a%00b').set(as('admin'));
    expect(query.status).toBe(400);
    expect(query.body.error.message).toMatch(/^The text in query\.q contains a NUL/);
  });
});

describe('upload ids on the tus routes', () => {
  const tus = (path: string) =>
    request(ctx.app).get(path).set(as('operator')).set(SYNC_PROTOCOL_HEADER, String(SYNC_PROTOCOL_VERSION));

  test.each([
    ['..%2F..%2Fetc%2Fpasswd', 'a parent path'],
    ['%2E%2E%2Fx', 'encoded dots'],
    ['..%5C..%5Cboot.ini', 'backslashes'],
  ])('when the id is %s (%s), then it is a 400 that says an id is a single name', async (id) => {
    const res = await tus(`/api/sync/uploads/${id}`);
    expect(res.status).toBe(400);
    expect(JSON.parse(res.text)).toEqual({
      error: {
        code: 'upload_refused',
        message: 'An upload id is a single name; it cannot contain a path (/, \\ or ..).',
      },
    });
  });

  test("when the id starts with the caller's clinic and then climbs out, then it is still a 400", async () => {
    const res = await tus(`/api/sync/uploads/${clinic.id}.x%2F..%2F..%2F${randomUUID()}.y`);
    expect(res.status).toBe(400);
  });

  test("when the id is another clinic's, then it is a 404", async () => {
    const res = await tus(`/api/sync/uploads/${randomUUID()}.${'a'.repeat(64)}.abc`);
    expect(res.status).toBe(404);
    expect(JSON.parse(res.text).error.message).toBe('There is no such upload.');
  });
});

describe('Cache-Control on API answers', () => {
  // One route per method and role group of the table, with its caller, so a new route family is sampled too.
  const sample = accessTable.filter(
    (route, i, all) =>
      all.findIndex((r) => r.method === route.method && String(r.access) === String(route.access)) === i,
  );

  test.each(sample.map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))(
    'when %s answers, then it says no-store',
    async (_name, route) => {
      const path = route.path.replace(/:[A-Za-z]+/g, () => clientId);
      let req = request(ctx.app)[route.method](path);
      if (route.access !== 'public') req = req.set(as(route.access[route.access.length - 1]));
      const res = await (route.method === 'get' || route.method === 'delete' ? req : req.send({}));
      expect(res.headers['cache-control']).toMatch(/\bno-store\b/);
    },
  );

  test('when a trace of a session is asked for, then it is not kept in a cache either', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${randomUUID()}/sites/mitral/trace`)
      .set(as('practitioner'));
    expect(res.headers['cache-control']).toBe('no-store');
  });
});
