import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type { Role } from '@/shared/protocol';
import { reviewSessionPageSchema, type ReviewSessionRow } from '@/shared/protocol/review';
import { addClient, addSession } from './helpers/review-fixtures';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
let other: TestClinic;
let tokens: Record<Role, string>;
let otherTokens: Record<Role, string>;
const s: Record<string, string> = {};
const c: Record<string, string> = {};

// Six sessions with one distinguishing fact each, so every filter has exactly one right answer.
beforeAll(async () => {
  clinic = await makeClinic('Review list');
  other = await makeClinic('Elsewhere');
  tokens = await tokensFor(ctx.app, clinic);
  otherTokens = await tokensFor(ctx.app, other);
  c.ada = await addClient(clinic.id, 'Ada', 'Brightwater');
  c.bo = await addClient(clinic.id, 'Bo', 'Calloway');
  c.cy = await addClient(clinic.id, 'Cy', 'Abernethy');
  c.theirs = await addClient(other.id, 'Ada', 'Brightwater');
  const op = clinic.users.operator.id;
  const pr = clinic.users.practitioner.id; // a second "operator" for the operator filter
  s.adaOct = await addSession({
    clinicId: clinic.id,
    clientId: c.ada,
    operatorId: op,
    startedAt: new Date('2026-10-01T09:00:00Z'),
  });
  s.adaNov = await addSession({
    clinicId: clinic.id,
    clientId: c.ada,
    operatorId: op,
    startedAt: new Date('2026-11-10T09:00:00Z'),
    status: 'reviewed',
  });
  s.boFast = await addSession({
    clinicId: clinic.id,
    clientId: c.bo,
    operatorId: pr,
    startedAt: new Date('2026-11-12T10:00:00Z'),
    sites: { mitral: { verdict: 'good', heartRateBpm: 118 }, aortic: { verdict: 'good', heartRateBpm: 117 } },
  });
  s.boIrregular = await addSession({
    clinicId: clinic.id,
    clientId: c.bo,
    operatorId: op,
    startedAt: new Date('2026-11-13T10:00:00Z'),
    sites: { mitral: { verdict: 'usable', heartRateBpm: 72, irregular: true } },
  });
  s.cyRetake = await addSession({
    clinicId: clinic.id,
    clientId: c.cy,
    operatorId: op,
    startedAt: new Date('2026-11-14T10:00:00Z'),
    sites: {
      mitral: { verdict: 'retake', heartRateBpm: 70 },
      tricuspid: { verdict: 'good', heartRateBpm: 70 },
    },
  });
  s.cyCancelled = await addSession({
    clinicId: clinic.id,
    clientId: c.cy,
    operatorId: null,
    startedAt: new Date('2026-11-15T10:00:00Z'),
    status: 'cancelled',
  });
  await addSession({ clinicId: other.id, clientId: c.theirs, startedAt: new Date('2026-11-11T09:00:00Z') });
});
afterAll(() => ctx.close());

async function list(query: Record<string, string | number | boolean>, token = tokens.practitioner) {
  const res = await request(ctx.app)
    .get('/api/review/sessions')
    .query(query)
    .set('authorization', `Bearer ${token}`);
  expect(res.status).toBe(200);
  return reviewSessionPageSchema.parse(res.body);
}
const ids = (rows: ReviewSessionRow[]) => rows.map((r) => r.id);

describe('GET /api/review/sessions filters', () => {
  test('when no filter is given, then every session of the clinic is listed newest first and none of another clinic', async () => {
    const page = await list({});
    expect(ids(page.sessions)).toEqual([
      s.cyCancelled,
      s.cyRetake,
      s.boIrregular,
      s.boFast,
      s.adaNov,
      s.adaOct,
    ]);
    expect(page.total).toBe(6);
  });

  test('when filtered by client, then only that client’s sessions come back', async () => {
    expect(ids((await list({ clientId: c.ada })).sessions)).toEqual([s.adaNov, s.adaOct]);
  });

  test('when filtered by operator, then only sessions that operator recorded come back', async () => {
    expect(ids((await list({ operatorId: clinic.users.practitioner.id })).sessions)).toEqual([s.boFast]);
  });

  test('when filtered by a date range, then both ends are inclusive days', async () => {
    const page = await list({ from: '2026-11-12', to: '2026-11-13' });
    expect(ids(page.sessions)).toEqual([s.boIrregular, s.boFast]);
  });

  test('when filtered by status, then only that status comes back', async () => {
    expect(ids((await list({ status: 'reviewed' })).sessions)).toEqual([s.adaNov]);
    expect(ids((await list({ status: 'cancelled' })).sessions)).toEqual([s.cyCancelled]);
  });

  test('when filtered by flagged, then a rate above 100 bpm or an irregular rhythm flags, and the rest are unflagged', async () => {
    // Adult resting range 60–100 bpm (common practice, no source): 118 bpm is above it.
    expect(ids((await list({ flagged: 'true' })).sessions)).toEqual([s.boIrregular, s.boFast]);
    expect(ids((await list({ flagged: 'false' })).sessions)).toEqual([
      s.cyCancelled,
      s.cyRetake,
      s.adaNov,
      s.adaOct,
    ]);
  });

  test('when filtered by quality, then the worst site decides the session’s quality', async () => {
    expect(ids((await list({ quality: 'retake' })).sessions)).toEqual([s.cyRetake]);
    expect(ids((await list({ quality: 'usable' })).sessions)).toEqual([s.boIrregular]);
    expect((await list({ quality: 'good' })).sessions).toHaveLength(4);
  });

  test('when searched by part of a client name, then case does not matter and first and last name match together', async () => {
    expect(ids((await list({ q: 'brightW' })).sessions)).toEqual([s.adaNov, s.adaOct]);
    expect(ids((await list({ q: 'ada bright' })).sessions)).toEqual([s.adaNov, s.adaOct]);
    expect((await list({ q: '%' })).sessions).toEqual([]);
  });

  test('when filters are combined, then all of them apply', async () => {
    expect(ids((await list({ clientId: c.bo, flagged: 'true', quality: 'usable' })).sessions)).toEqual([
      s.boIrregular,
    ]);
  });

  test('when the date range is backwards or a filter is malformed, then it is a 400 with a message', async () => {
    const backwards = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ from: '2026-12-01', to: '2026-11-01' })
      .set('authorization', `Bearer ${tokens.practitioner}`);
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toMatch(/start date is after the end date/);
    const bad = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ status: 'lost' })
      .set('authorization', `Bearer ${tokens.practitioner}`);
    expect(bad.status).toBe(400);
  });
});

describe('GET /api/review/sessions sorting and paging', () => {
  test('when sorted by client name ascending, then last names order the rows and ties keep a stable order', async () => {
    const rows = (await list({ sort: 'clientName', dir: 'asc' })).sessions;
    expect(rows.map((r) => r.clientName.split(' ')[1])).toEqual([
      'Abernethy',
      'Abernethy',
      'Brightwater',
      'Brightwater',
      'Calloway',
      'Calloway',
    ]);
  });

  test('when sorted by client name descending, then the order is reversed', async () => {
    const rows = (await list({ sort: 'clientName', dir: 'desc' })).sessions;
    expect(rows[0].clientName).toBe('Bo Calloway');
    expect(rows[5].clientName).toBe('Cy Abernethy');
  });

  test('when sorted by start ascending, then the oldest is first', async () => {
    expect((await list({ sort: 'startedAt', dir: 'asc' })).sessions[0].id).toBe(s.adaOct);
  });

  test('when sorted by operator, then sessions without an operator sort first ascending', async () => {
    const rows = (await list({ sort: 'operatorName', dir: 'asc' })).sessions;
    expect(rows[0].operatorName).toBeNull();
    const names = rows.slice(1).map((r) => r.operatorName!);
    expect([...names].sort()).toEqual(names);
  });

  test('when sorted by status, then statuses come in alphabetical order', async () => {
    const statuses = (await list({ sort: 'status', dir: 'asc' })).sessions.map((r) => r.status);
    expect(statuses).toEqual(['cancelled', 'completed', 'completed', 'completed', 'completed', 'reviewed']);
  });

  test('when paged two at a time, then the pages join into the full list with no repeats', async () => {
    const all: string[] = [];
    let cursor: string | null | undefined;
    let pages = 0;
    do {
      const page = await list(cursor ? { limit: 2, cursor } : { limit: 2 });
      all.push(...ids(page.sessions));
      cursor = page.nextCursor;
      pages++;
    } while (cursor);
    expect(pages).toBe(3);
    expect(all).toEqual([s.cyCancelled, s.cyRetake, s.boIrregular, s.boFast, s.adaNov, s.adaOct]);
  });

  test('when a cursor is reused with another sort or is garbage, then it is refused with a 400', async () => {
    const first = await list({ limit: 2 });
    const res = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ limit: 2, cursor: first.nextCursor!, sort: 'clientName' })
      .set('authorization', `Bearer ${tokens.practitioner}`);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_cursor');
    const junk = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ cursor: 'not-a-cursor' })
      .set('authorization', `Bearer ${tokens.practitioner}`);
    expect(junk.status).toBe(400);
  });
});

describe('paging while sessions keep arriving', () => {
  test('when 30 sessions are inserted between page requests, then no session present at the start is repeated or skipped', async () => {
    const pagingClinic = await makeClinic('Paging');
    const pagingTokens = await tokensFor(ctx.app, pagingClinic);
    const client = await addClient(pagingClinic.id, 'Dee', 'Paging');
    const base = Date.parse('2026-09-01T08:00:00Z');
    const original: string[] = [];
    for (let i = 0; i < 20; i++) {
      original.push(
        await addSession({
          clinicId: pagingClinic.id,
          clientId: client,
          startedAt: new Date(base + i * 3_600_000),
          sites: {},
        }),
      );
    }
    const seen: string[] = [];
    let cursor: string | null = null;
    let inserted = 0;
    do {
      const query: Record<string, string | number> = { limit: 3 };
      if (cursor) query.cursor = cursor;
      // Newer and older sessions land concurrently with the page request.
      const [page] = await Promise.all([
        list(query, pagingTokens.practitioner),
        ...[0, 1, 2].map(() =>
          addSession({
            clinicId: pagingClinic.id,
            clientId: client,
            startedAt: new Date(base + (inserted++ % 2 ? 1 : -1) * (40 + inserted) * 3_600_000),
            sites: {},
          }),
        ),
      ]);
      seen.push(...ids(page.sessions));
      cursor = page.nextCursor;
    } while (cursor);
    expect(new Set(seen).size).toBe(seen.length);
    for (const id of original) expect(seen).toContain(id);
    // Among the originals, the order is the order they were listed in at the start: newest first.
    expect(seen.filter((id) => original.includes(id))).toEqual([...original].reverse());
  });
});

describe('the clinic’s own ranges', () => {
  test('when the clinic widens the heart-rate range at the aortic site only, then 105 bpm flags at mitral but not at aortic', async () => {
    const own = await makeClinic('Own ranges');
    const ownTokens = await tokensFor(ctx.app, own);
    await ctx.sequelize.query(
      `INSERT INTO range_overrides (id, clinic_id, metric, site, low, high, updated_by) VALUES (:id, :clinicId, 'heartRateBpm', 'aortic', 50, 110, :userId)`,
      { replacements: { id: randomUUID(), clinicId: own.id, userId: own.users.admin.id } },
    );
    const client = await addClient(own.id, 'Ora', 'Ranges');
    const atAortic = await addSession({
      clinicId: own.id,
      clientId: client,
      startedAt: new Date('2026-11-01T09:00:00Z'),
      sites: { aortic: { heartRateBpm: 105 } },
    });
    const atMitral = await addSession({
      clinicId: own.id,
      clientId: client,
      startedAt: new Date('2026-11-02T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 105 } },
    });
    expect(ids((await list({ flagged: 'true' }, ownTokens.practitioner)).sessions)).toEqual([atMitral]);
    expect(ids((await list({ flagged: 'false' }, ownTokens.practitioner)).sessions)).toEqual([atAortic]);
    const detail = await request(ctx.app)
      .get(`/api/review/sessions/${atAortic}`)
      .set('authorization', `Bearer ${ownTokens.practitioner}`);
    const rate = detail.body.sites[2].measurements.find((m: { key: string }) => m.key === 'heartRateBpm');
    expect(rate).toMatchObject({
      status: 'in_range',
      range: { low: 50, high: 110, source: 'Set by the clinic.' },
    });
  });
});

describe('who may list', () => {
  test('when an operator asks, then it is 403', async () => {
    const res = await request(ctx.app)
      .get('/api/review/sessions')
      .set('authorization', `Bearer ${tokens.operator}`);
    expect(res.status).toBe(403);
  });

  test('when another clinic filters by this clinic’s client, then it sees nothing', async () => {
    const page = await list({ clientId: c.ada }, otherTokens.practitioner);
    expect(page.sessions).toEqual([]);
    expect(page.total).toBe(0);
    expect(ids((await list({}, otherTokens.admin)).sessions)).not.toContain(s.adaOct);
  });
});
