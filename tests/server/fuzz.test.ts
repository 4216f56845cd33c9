// Every route of the access table, called by a role it admits, with wrong types, missing fields, huge and odd
// strings: no answer is a 5xx, no answer shows the server's insides, and every refusal is the project's error
// shape with words a person can act on. A fixed seed and a fixed count per route make each run the same.
// Sources: OWASP ASVS 4.0.3 V5.1.4 (structured data is checked against a schema), V7.4.1 (a generic message is
// shown when an unexpected error occurs), V14.3.3 (responses do not expose detailed version or system
// information), V8.2.1 (responses carrying sensitive data set anti-caching headers).
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { apiErrorSchema, SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION, type Role } from '@/shared/protocol';
import { accessTable, type RouteSpec } from '@/sync-server/src/routes/access-table';
import { startPracticeFakes, type PracticeFakes } from './helpers/practice-fakes';
import { insertClient, insertSession } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor } from './helpers/test-app';

const REQUESTS_PER_ROUTE = Number(process.env.FUZZ_REQUESTS_PER_ROUTE ?? 24);
const SEED = 0x46504f54;
const BODY_LIMIT_BYTES = 1024 * 1024;

const ctx = makeTestContext();
let fakes: PracticeFakes;
let tokens: Record<Role, string>;
const known = { clientId: '', sessionId: '' };

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  const clinic = await makeClinic('Fuzz');
  tokens = await tokensFor(ctx.app, clinic);
  known.clientId = await insertClient(ctx.sequelize, clinic.id);
  known.sessionId = await insertSession(ctx.sequelize, clinic.id, known.clientId);
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

/** mulberry32: a small seeded generator, so a failure found once is found again on the next run. */
function seededRandom(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const pick = <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)];
  return { next, pick };
}
type Random = ReturnType<typeof seededRandom>;

const oddStrings = [
  '',
  ' ',
  'a\u0000b',
  '\u0000',
  'é😀\u202e\ufeff\u200b',
  '__proto__',
  'constructor',
  '%zz',
  '%',
  '2026-02-31',
  '2026-13-45',
  '0000-01-01',
  '2026-02-31T10:00:00Z',
  '../../../../etc/passwd',
  '..%2F..%2Fetc%2Fpasswd',
  '..\\..\\boot.ini',
  "' OR 1=1 --",
  '<script>alert(1)</script>',
  '-1',
  'NaN',
  'true',
  'null',
  '9'.repeat(40),
  'x'.repeat(5_000),
  'y'.repeat(100_000),
];
const plausibleStrings = () => [
  randomUUID(),
  known.clientId,
  known.sessionId,
  '2026-03-31',
  '2026-03-31T14:05:00Z',
  'someone@example.test',
  'mitral',
  'admin',
  'fields',
  'server',
  'open',
  'a plain note',
];
const fieldNames = [
  'firstName',
  'lastName',
  'dateOfBirth',
  'email',
  'phone',
  'notes',
  'version',
  'findings',
  'plan',
  'followUpDate',
  'baseVersion',
  'keep',
  'fields',
  'note',
  'name',
  'role',
  'disabled',
  'password',
  'title',
  'body',
  'clientId',
  'offerId',
  'sendEmail',
  'confirmName',
  'low',
  'high',
  'retentionMonths',
  'reminderDaysBefore',
  'currency',
  'offers',
  'address',
  'logoDataUrl',
  'protocolVersion',
  'deviceId',
  'mutations',
  'checkpoint',
  'limit',
  'refreshToken',
  'to',
  'compareWith',
  '__proto__',
  'constructor',
];
const queryNames = [
  'q',
  'from',
  'to',
  'cursor',
  'sort',
  'dir',
  'page',
  'pageSize',
  'limit',
  'status',
  'flagged',
  'quality',
  'withinDays',
  'compareWith',
  'retention',
  'action',
  'userId',
  'entity',
  'entityId',
  'clientId',
  'operatorId',
];

function oddValue(random: Random, depth = 0): unknown {
  const kind = random.next();
  if (kind < 0.35) return random.pick(oddStrings);
  if (kind < 0.55) return random.pick(plausibleStrings());
  if (kind < 0.7)
    return random.pick([0, -1, 1, 1.5, 2 ** 31, 2 ** 53, -(2 ** 63), 1e308, Number.MAX_SAFE_INTEGER + 2]);
  if (kind < 0.78) return random.pick([true, false, null]);
  if (depth > 2) return random.pick(oddStrings);
  if (kind < 0.88)
    return Array.from({ length: Math.floor(random.next() * 3) }, () => oddValue(random, depth + 1));
  return oddObject(random, depth + 1);
}

// Object.fromEntries defines `__proto__` as an own key, as JSON.parse does, so it travels in the JSON.
function oddObject(random: Random, depth = 0): Record<string, unknown> {
  const size = Math.floor(random.next() * 6);
  return Object.fromEntries(
    Array.from({ length: size }, () => [random.pick(fieldNames), oddValue(random, depth)]),
  );
}

// Sync pushes get well-formed envelopes around odd changes, so the change checks are reached at all.
function oddMutation(random: Random) {
  return {
    mutationId: randomUUID(),
    entity: random.pick(['clients', 'consents', 'recording_sessions', 'site_recordings', 'users']),
    id: random.pick([randomUUID(), known.clientId, known.sessionId]),
    baseVersion: random.pick([0, 1, 2, -1]),
    change: Object.fromEntries(
      Array.from({ length: 1 + Math.floor(random.next() * 4) }, () => [
        random.pick([
          'firstName',
          'dateOfBirth',
          'followUpDate',
          'startedAt',
          'deletedAt',
          'constructor',
          '__proto__',
          'toString',
          'hasOwnProperty',
          'analysis',
          'clipSha256',
          'site',
          'status',
        ]),
        oddValue(random, 2),
      ]),
    ),
  };
}

function oddBody(route: RouteSpec, random: Random, n: number): unknown {
  if (n === 0) return { note: 'z'.repeat(BODY_LIMIT_BYTES + 1) };
  if (n === 1) return {};
  if (n === 2) return oddValue(random, 3);
  if (route.path === '/api/sync/push' && random.next() < 0.6) {
    return {
      protocolVersion: SYNC_PROTOCOL_VERSION,
      deviceId: randomUUID(),
      mutations: Array.from({ length: 1 + Math.floor(random.next() * 3) }, () => oddMutation(random)),
    };
  }
  return oddObject(random);
}

const oddPathParts = [
  '%zz',
  '%E0%A4%A',
  '%00',
  '..%2F..%2Fetc%2Fpasswd',
  '..%5C..%5Cboot.ini',
  '%2E%2E',
  '__proto__',
  'constructor',
  '2026-02-31',
  encodeURIComponent('é😀'),
  'x'.repeat(3_000),
];

function concretePath(route: RouteSpec, random: Random): string {
  return route.path.replace(/:([A-Za-z]+)/g, (_whole, name: string) => {
    const roll = random.next();
    if (roll < 0.45) return random.pick(oddPathParts);
    if (name === 'site') return random.pick(['mitral', 'pulmonic']);
    if (name === 'clientId' || (name === 'id' && route.path.startsWith('/api/client-records')))
      return known.clientId;
    if (name === 'sessionId' || name === 'otherId') return known.sessionId;
    return randomUUID();
  });
}

function oddQuery(random: Random): string {
  const pairs = Array.from({ length: Math.floor(random.next() * 4) }, () => {
    const name = random.pick(queryNames);
    const value = (
      name === 'cursor' && random.next() < 0.7
        ? Buffer.from(JSON.stringify(oddObject(random))).toString('base64url')
        : String(oddValue(random, 3))
    ).slice(0, 5_000); // Node answers 431 itself past its 16 KB header limit, before the app sees anything
    const encoded = random.next() < 0.2 ? value.replace(/ /g, '+') : encodeURIComponent(value);
    return `${name}=${encoded}`;
  });
  return pairs.length ? `?${pairs.join('&')}` : '';
}

const tokenFor = (route: RouteSpec): string | undefined =>
  route.access === 'public' ? undefined : tokens[route.access[route.access.length - 1]];

// What must never reach a caller: stack frames, source paths, SQL, and the names of the libraries underneath.
const INTERNALS = [
  /\bat [\w.<>]+ \(/,
  /\.(?:ts|js):\d+/,
  /\/work\/|node_modules|sync-server\//,
  /Sequelize\w*Error|SequelizeDatabaseError|DatabaseError|ZodError\b/,
  /\berror: (?:syntax error|invalid input|relation|column|duplicate key|null value|insert or update)/i,
  /\b(?:SELECT|INSERT INTO|UPDATE \w+ SET|DELETE FROM)\b/,
  /\b(?:TypeError|ReferenceError|RangeError|URIError|SyntaxError)\b/,
  /ECONNREFUSED|ECONNRESET|\bpg_\w+|SQLSTATE/,
];

// tus answers its own protocol errors in plain text (412 without Tus-Resumable, 403 ...), as the tus 1.0 spec
// lets it; the JSON error shape is checked on every other route.
const speaksTus = (route: RouteSpec) => route.path.startsWith('/api/sync/uploads');

describe.each(accessTable.map((route) => [`${route.method.toUpperCase()} ${route.path}`, route] as const))(
  '%s',
  (name, route) => {
    test(`when it gets ${REQUESTS_PER_ROUTE} odd requests, then none is a 5xx or shows internals, and each refusal says what to fix`, async () => {
      const random = seededRandom(SEED ^ [...name].reduce((h, c) => Math.imul(h, 31) + c.charCodeAt(0), 7));
      const failures: string[] = [];
      for (let n = 0; n < REQUESTS_PER_ROUTE; n += 1) {
        const url = `${concretePath(route, random)}${oddQuery(random)}`;
        let req = request(ctx.app)[route.method](url);
        const token = tokenFor(route);
        if (token) req = req.set('authorization', `Bearer ${token}`);
        if (route.path.startsWith('/api/sync') && random.next() < 0.85)
          req = req.set(SYNC_PROTOCOL_HEADER, String(SYNC_PROTOCOL_VERSION));
        if (speaksTus(route) && random.next() < 0.7) req = req.set('tus-resumable', '1.0.0');
        const body =
          route.method === 'get' || route.method === 'delete' ? undefined : oddBody(route, random, n);
        const res = await (body === undefined
          ? req
          : req.set('content-type', 'application/json').send(JSON.stringify(body)));
        const text = res.text ?? '';
        const where = `${route.method.toUpperCase()} ${url.slice(0, 160)} -> ${res.status}`;
        if (res.status >= 500) failures.push(`${where}: ${text.slice(0, 300)}`);
        const leak = INTERNALS.find((pattern) => pattern.test(text));
        if (leak) failures.push(`${where} shows ${leak}: ${text.slice(0, 300)}`);
        if (res.status >= 400 && !speaksTus(route)) {
          const shaped = apiErrorSchema.safeParse(res.body);
          if (!shaped.success || shaped.data.error.message.trim().length < 10)
            failures.push(`${where} is not the error shape with a message: ${text.slice(0, 300)}`);
        }
        if (route.path.startsWith('/api/') && !/no-store/.test(String(res.headers['cache-control'])))
          failures.push(`${where} lacks Cache-Control: no-store (got ${res.headers['cache-control']})`);
      }
      expect(failures).toEqual([]);
    });
  },
);
