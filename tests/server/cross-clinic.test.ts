// Tenancy for every route, generated from the access table like the role test: clinic B's users of every
// allowed role get nothing of clinic A's. Lists and answers hold none of A's ids or names, a request naming an
// id of A's answers exactly as for an id that does not exist (404), and after every request A's rows are as
// they were. A route added to the table without a case here fails the last test.
// OWASP ASVS 4.0.3 V4.2.1 (no access to other tenants' records by id: IDOR), V4.1.3 (least privilege).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { roles, type Role } from '@/shared/protocol';
import { clinicSettingsSchema } from '@/shared/protocol/practice';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION, type Mutation } from '@/shared/protocol/sync';
import { accessTable, type RouteSpec } from '@/sync-server/src/routes/access-table';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { linkIn, messagesTo, startPracticeFakes, type PracticeFakes } from './helpers/practice-fakes';
import { addClient, addSession, burstWav, storeClip } from './helpers/review-fixtures';
import { clientFields } from './sync-helpers/devices';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let A: TestClinic;
let B: TestClinic;
let tokensA: Record<Role, string>;
let tokensB: Record<Role, string>;

/** What clinic A holds, by id; every one of these is something B must never see or touch. */
const a = {
  clientId: '',
  syncedClientId: randomUUID(),
  sessionId: '',
  otherSessionId: '',
  clipSha256: '',
  reportMailId: '',
  reportMessageId: '',
  invitationId: '',
  invitationToken: '',
  invitationEmail: `joiner.${randomUUID().slice(0, 6)}@clinic-a.fourpoint.test`,
  conflictId: '',
  paymentId: '',
  checkoutId: '',
  uploadId: '',
};
const CLIENT = { first: 'Ottoline', last: 'Brackwater', email: 'ottoline.brackwater@client.fourpoint.test' };
const CONSENT_TITLE = 'Consent of clinic A only';

const auth = (token: string) => ({ authorization: `Bearer ${token}` });
const sync = { [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION) };
const tus = { ...sync, 'tus-resumable': '1.0.0' };

/** Everything that would betray A's data in an answer to B. */
function markersOfA(): string[] {
  return [
    A.id,
    A.name,
    ...Object.values(A.users).flatMap((u) => [u.id, u.email, u.name]),
    CLIENT.first,
    CLIENT.last,
    CLIENT.email,
    CONSENT_TITLE,
    a.invitationEmail,
    ...Object.values(a).filter((v) => v.length >= 32 && !v.includes('@')),
  ];
}

/** A digest of every row of clinic A, in every table that has a clinic. */
async function fingerprintOfA(): Promise<Record<string, string>> {
  const tables = (await ctx.sequelize.query(
    `SELECT table_name FROM information_schema.columns
     WHERE table_schema = 'public' AND column_name = 'clinic_id' ORDER BY table_name`,
    { type: 'SELECT' },
  )) as { table_name: string }[];
  const digest: Record<string, string> = {};
  for (const { table_name: table } of [...tables, { table_name: 'clinics' }]) {
    const column = table === 'clinics' ? 'id' : 'clinic_id';
    const [row] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS n, md5(coalesce(string_agg(t::text, '|' ORDER BY t::text), '')) AS h
       FROM "${table}" t WHERE ${column} = :clinicId`,
      { replacements: { clinicId: A.id }, type: 'SELECT' },
    )) as { n: number; h: string }[];
    digest[table] = `${row.n}:${row.h}`;
  }
  return digest;
}

type Probe = { path: string; body?: unknown; headers?: Record<string, string> };
type Answer = { status: number; text: string };

/**
 * How B probes one route. `namesA`: the probe names A's ids, so it must answer as for an unknown id (`unknown`
 * is the same request with fresh ids) with a 4xx. Otherwise it acts on B's own clinic and must leak nothing.
 * `extra` checks what only that route can tell.
 */
type CrossCase =
  | { notClinicData: string }
  | {
      probe: () => Probe;
      namesA?: { unknown: () => Probe };
      /** Why this answer may hold something of A's: only what the caller sent or was sent to them. */
      showsA?: string;
      extra?: (answer: Answer, role: Role) => Promise<void>;
    };

const fresh = () => randomUUID();
const pushBody = (mutations: Mutation[]) => ({
  protocolVersion: SYNC_PROTOCOL_VERSION,
  deviceId: randomUUID(),
  mutations,
});
const updateOf = (id: string, baseVersion: number, firstName: string): Mutation => ({
  mutationId: randomUUID(),
  entity: 'clients',
  id,
  baseVersion,
  change: { firstName },
});
const notes = { findings: 'Overwritten by B', plan: null, followUpDate: null, baseVersion: 1 };

const cases: Record<string, CrossCase> = {
  'get /api/health': { notClinicData: 'whether the server and database are up' },
  'get /api/health/live': { notClinicData: 'whether this server process answers' },
  'get /api/health/ready': {
    notClinicData: 'whether the database and blob storage answer and the process is not stopping',
  },
  'post /api/auth/sign-in': { notClinicData: 'signs in by e-mail and password; covered by the auth tests' },
  'post /api/auth/refresh': { notClinicData: 'renews the caller’s own session only' },
  'post /api/auth/sign-out': { notClinicData: 'ends the caller’s own session only' },
  'post /api/auth/password-reset': {
    // B asks for a link for its own admin and for an address nobody uses: the same answer, nothing of A's.
    probe: () => ({ path: '/api/auth/password-reset', body: { email: B.users.admin.email } }),
    extra: async (answer) => {
      expect(answer.status).toBe(202);
      const unknown = await request(ctx.app)
        .post('/api/auth/password-reset')
        .send({ email: `nobody.${fresh().slice(0, 8)}@clinic-b.test` });
      expect(unknown.status).toBe(202);
      expect(JSON.parse(answer.text)).toEqual(unknown.body);
    },
  },
  'get /api/auth/password-reset/:token': {
    probe: () => ({ path: `/api/auth/password-reset/${a.invitationToken}` }),
    extra: async (answer) => {
      expect(answer.status).toBe(404);
      expect(JSON.parse(answer.text).error.code).toBe('reset_link_invalid');
    },
  },
  'post /api/auth/password-reset/:token': {
    // An invitation link of A's is no reset link: refused, and A's admin keeps their password.
    probe: () => ({
      path: `/api/auth/password-reset/${a.invitationToken}`,
      body: { password: 'b tries a password for a' },
    }),
    extra: async (answer) => {
      expect(answer.status).toBe(404);
      expect(JSON.parse(answer.text).error.code).toBe('reset_link_invalid');
    },
  },
  'get /api/me': { probe: () => ({ path: '/api/me' }) },
  'get /api/clients': { probe: () => ({ path: `/api/clients?q=${CLIENT.last}` }) },
  'get /api/sessions': { probe: () => ({ path: '/api/sessions' }) },
  'post /api/sync/push': {
    probe: () => ({ path: '/api/sync/push', body: pushBody([updateOf(a.syncedClientId, 1, 'Overwritten')]) }),
    extra: async (answer) => {
      expect(answer.status).toBe(200);
      expect(JSON.parse(answer.text).results[0].status).toBe('rejected');
    },
  },
  'post /api/sync/pull': {
    probe: () => ({
      path: '/api/sync/pull',
      body: { protocolVersion: SYNC_PROTOCOL_VERSION, deviceId: randomUUID(), checkpoint: '0', limit: 1000 },
    }),
  },
  'get /api/sync/blobs/:sha256': {
    // A clip's hash is content, not an id of A's: B hears only that B does not hold it (its own hash echoed).
    probe: () => ({ path: `/api/sync/blobs/${a.clipSha256}`, headers: sync }),
    showsA: 'the hash B itself sent, echoed',
    extra: async (answer) => {
      expect(answer.status).toBe(200);
      expect(JSON.parse(answer.text)).toEqual({ sha256: a.clipSha256, state: 'missing', failure: null });
    },
  },
  'post /api/sync/uploads': { probe: () => ({ path: '/api/sync/uploads', headers: tus }) },
  'get /api/sync/uploads/:id': {
    probe: () => ({ path: `/api/sync/uploads/${a.uploadId}`, headers: tus }),
    namesA: {
      unknown: () => ({ path: `/api/sync/uploads/${A.id}.${'0'.repeat(64)}.unknown`, headers: tus }),
    },
  },
  'patch /api/sync/uploads/:id': {
    probe: () => ({
      path: `/api/sync/uploads/${a.uploadId}`,
      headers: { ...tus, 'upload-offset': '0', 'content-type': 'application/offset+octet-stream' },
      body: Buffer.from('intruder'),
    }),
    namesA: {
      unknown: () => ({
        path: `/api/sync/uploads/${A.id}.${'0'.repeat(64)}.unknown`,
        headers: { ...tus, 'upload-offset': '0', 'content-type': 'application/offset+octet-stream' },
        body: Buffer.from('intruder'),
      }),
    },
  },
  'delete /api/sync/uploads/:id': {
    probe: () => ({ path: `/api/sync/uploads/${a.uploadId}`, headers: tus }),
    namesA: {
      unknown: () => ({ path: `/api/sync/uploads/${A.id}.${'0'.repeat(64)}.unknown`, headers: tus }),
    },
  },
  'get /api/clinic/public-key': {
    probe: () => ({ path: '/api/clinic/public-key' }),
    extra: async (answer) => {
      const ofA = await request(ctx.app).get('/api/clinic/public-key').set(auth(tokensA.operator));
      expect(JSON.parse(answer.text).publicKey).not.toBe(ofA.body.publicKey);
    },
  },
  'get /api/admin/conflicts': {
    probe: () => ({ path: '/api/admin/conflicts' }),
    extra: async (answer) => expect(JSON.parse(answer.text).conflicts).toEqual([]),
  },
  'get /api/admin/conflicts/:id': {
    probe: () => ({ path: `/api/admin/conflicts/${a.conflictId}` }),
    namesA: { unknown: () => ({ path: `/api/admin/conflicts/${fresh()}` }) },
  },
  'post /api/admin/conflicts/:id/resolve': {
    probe: () => ({
      path: `/api/admin/conflicts/${a.conflictId}/resolve`,
      body: { keep: 'client', note: 'B' },
    }),
    namesA: {
      unknown: () => ({
        path: `/api/admin/conflicts/${fresh()}/resolve`,
        body: { keep: 'client', note: 'B' },
      }),
    },
  },
  'get /api/review/sessions': { probe: () => ({ path: '/api/review/sessions' }) },
  'get /api/review/sessions/:sessionId': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}` }) },
  },
  'get /api/review/sessions/:sessionId/sites/:site/trace': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/sites/mitral/trace` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/sites/mitral/trace` }) },
  },
  'get /api/review/sessions/:sessionId/sites/:site/audio': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/sites/mitral/audio` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/sites/mitral/audio` }) },
  },
  'get /api/review/sessions/:sessionId/earlier': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/earlier` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/earlier` }) },
  },
  'get /api/review/sessions/:sessionId/compare/:otherId': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/compare/${a.otherSessionId}` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/compare/${fresh()}` }) },
  },
  'get /api/review/clients/:clientId/trends': {
    probe: () => ({ path: `/api/review/clients/${a.clientId}/trends` }),
    namesA: { unknown: () => ({ path: `/api/review/clients/${fresh()}/trends` }) },
  },
  'put /api/review/sessions/:sessionId/notes': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/notes`, body: notes }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/notes`, body: notes }) },
  },
  'put /api/review/sessions/:sessionId/referral-flag': {
    probe: () => ({
      path: `/api/review/sessions/${a.sessionId}/referral-flag`,
      body: { flagged: true, note: 'Probe from clinic B' },
    }),
    namesA: {
      unknown: () => ({
        path: `/api/review/sessions/${fresh()}/referral-flag`,
        body: { flagged: true, note: 'Probe from clinic B' },
      }),
    },
  },
  'get /api/review/sessions/:sessionId/report-mail-preview': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/report-mail-preview` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/report-mail-preview` }) },
  },
  'get /api/review/sessions/:sessionId/report': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/report` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/report` }) },
  },
  'post /api/review/sessions/:sessionId/report-mails': {
    probe: () => ({
      path: `/api/review/sessions/${a.sessionId}/report-mails`,
      body: { to: 'b@clinic-b.test' },
    }),
    namesA: {
      unknown: () => ({
        path: `/api/review/sessions/${fresh()}/report-mails`,
        body: { to: 'b@clinic-b.test' },
      }),
    },
  },
  'get /api/review/sessions/:sessionId/report-mails': {
    probe: () => ({ path: `/api/review/sessions/${a.sessionId}/report-mails` }),
    namesA: { unknown: () => ({ path: `/api/review/sessions/${fresh()}/report-mails` }) },
  },
  'post /api/review/report-mails/:mailId/retry': {
    probe: () => ({ path: `/api/review/report-mails/${a.reportMailId}/retry` }),
    namesA: { unknown: () => ({ path: `/api/review/report-mails/${fresh()}/retry` }) },
  },
  'get /api/admin/mailbox/messages': { probe: () => ({ path: '/api/admin/mailbox/messages' }) },
  'get /api/admin/mailbox/messages/:messageId': {
    probe: () => ({ path: `/api/admin/mailbox/messages/${a.reportMessageId}` }),
    namesA: { unknown: () => ({ path: `/api/admin/mailbox/messages/${fresh()}` }) },
  },
  'get /api/admin/mailbox/messages/:messageId/attachments/:index': {
    probe: () => ({ path: `/api/admin/mailbox/messages/${a.reportMessageId}/attachments/0` }),
    namesA: { unknown: () => ({ path: `/api/admin/mailbox/messages/${fresh()}/attachments/0` }) },
  },
  'get /api/team': { probe: () => ({ path: '/api/team' }) },
  'post /api/team/invitations': {
    // B's invitation is B's; inviting A's address would only tell B it is taken, which the test below covers.
    probe: () => ({
      path: '/api/team/invitations',
      body: { email: `b.${randomUUID().slice(0, 6)}@clinic-b.test`, name: 'B Invitee', role: 'operator' },
    }),
  },
  'delete /api/team/invitations/:id': {
    probe: () => ({ path: `/api/team/invitations/${a.invitationId}` }),
    namesA: { unknown: () => ({ path: `/api/team/invitations/${fresh()}` }) },
  },
  'patch /api/team/users/:id': {
    probe: () => ({ path: `/api/team/users/${A.users.admin.id}`, body: { disabled: true } }),
    namesA: { unknown: () => ({ path: `/api/team/users/${fresh()}`, body: { disabled: true } }) },
  },
  'get /api/invitations/:token': {
    // The link is the invitee's: it shows A's invitation to whoever holds it, never anything of B's, and B's
    // session changes nothing about it.
    probe: () => ({ path: `/api/invitations/${a.invitationToken}` }),
    showsA: 'the invitee’s own link names the clinic that invited them',
    extra: async (answer) => {
      expect(answer.status).toBe(200);
      expect(JSON.parse(answer.text)).toMatchObject({ clinicName: A.name, email: a.invitationEmail });
    },
  },
  'post /api/invitations/:token/accept': {
    probe: () => ({
      path: `/api/invitations/${a.invitationToken}/accept`,
      body: { email: B.users.admin.email, name: 'B Admin', password: 'b admin joins a password' },
    }),
    extra: async (answer) => {
      expect(answer.status).toBe(403);
      expect(JSON.parse(answer.text).error.code).toBe('invitation_other_address');
    },
  },
  'get /api/admin/attention': {
    probe: () => ({ path: '/api/admin/attention' }),
    extra: async (answer) => expect(JSON.parse(answer.text).openConflicts).toBe(0),
  },
  'get /api/client-records': { probe: () => ({ path: `/api/client-records?q=${CLIENT.last}` }) },
  'post /api/client-records': {
    probe: () => ({ path: '/api/client-records', body: { firstName: 'Bertil', lastName: 'Of B' } }),
  },
  'get /api/client-records/:id': {
    probe: () => ({ path: `/api/client-records/${a.clientId}` }),
    namesA: { unknown: () => ({ path: `/api/client-records/${fresh()}` }) },
  },
  'patch /api/client-records/:id': {
    probe: () => ({
      path: `/api/client-records/${a.clientId}`,
      body: { firstName: 'X', lastName: 'Y', version: 1 },
    }),
    namesA: {
      unknown: () => ({
        path: `/api/client-records/${fresh()}`,
        body: { firstName: 'X', lastName: 'Y', version: 1 },
      }),
    },
  },
  'get /api/client-records/:id/export': {
    probe: () => ({ path: `/api/client-records/${a.clientId}/export` }),
    namesA: { unknown: () => ({ path: `/api/client-records/${fresh()}/export` }) },
  },
  'post /api/client-records/:id/erase': {
    probe: () => ({
      path: `/api/client-records/${a.clientId}/erase`,
      body: { confirmName: `${CLIENT.first} ${CLIENT.last}` },
    }),
    namesA: {
      unknown: () => ({
        path: `/api/client-records/${fresh()}/erase`,
        body: { confirmName: `${CLIENT.first} ${CLIENT.last}` },
      }),
    },
  },
  'get /api/consent-texts': { probe: () => ({ path: '/api/consent-texts' }) },
  'post /api/consent-texts': {
    probe: () => ({ path: '/api/consent-texts', body: { title: 'B', body: 'B text' } }),
  },
  'get /api/follow-ups/due': { probe: () => ({ path: '/api/follow-ups/due' }) },
  'post /api/follow-ups/reminders/run': { probe: () => ({ path: '/api/follow-ups/reminders/run' }) },
  'get /api/billing/payments': { probe: () => ({ path: '/api/billing/payments' }) },
  'post /api/billing/payments': {
    probe: () => ({
      path: '/api/billing/payments',
      body: { clientId: a.clientId, offerId: 'visit', sendEmail: false },
    }),
    namesA: {
      unknown: () => ({
        path: '/api/billing/payments',
        body: { clientId: fresh(), offerId: 'visit', sendEmail: false },
      }),
    },
  },
  'post /api/billing/payments/:id/refund': {
    probe: () => ({ path: `/api/billing/payments/${a.paymentId}/refund` }),
    namesA: { unknown: () => ({ path: `/api/billing/payments/${fresh()}/refund` }) },
  },
  'post /webhooks/payments': {
    // Only the provider's signature moves a payment; an unsigned event naming A's payment changes nothing.
    probe: () => ({
      path: '/webhooks/payments',
      body: {
        type: 'checkout.session.completed',
        data: { object: { id: a.checkoutId, metadata: { paymentId: a.paymentId } } },
      },
    }),
  },
  'get /payments/complete': { probe: () => ({ path: `/payments/complete?session_id=${a.checkoutId}` }) },
  'get /api/audit': { probe: () => ({ path: '/api/audit' }) },
  'get /api/settings': { probe: () => ({ path: '/api/settings' }) },
  'put /api/settings': {
    probe: () => ({
      path: '/api/settings',
      body: {
        name: 'Clinic B renamed',
        retentionMonths: 96,
        reminderDaysBefore: 2,
        currency: 'usd',
        offers: [],
      },
    }),
  },
  'get /api/settings/ranges': { probe: () => ({ path: '/api/settings/ranges' }) },
  'delete /api/settings/ranges': { probe: () => ({ path: '/api/settings/ranges' }) },
  'put /api/settings/ranges/:metric/:site': {
    probe: () => ({ path: '/api/settings/ranges/heartRateBpm/mitral', body: { low: 40, high: 45 } }),
  },
  'delete /api/settings/ranges/:metric/:site': {
    probe: () => ({ path: '/api/settings/ranges/heartRateBpm/mitral' }),
  },
};

async function send(route: RouteSpec, probe: Probe, token: string | null): Promise<Answer> {
  let req = request(ctx.app)[route.method](probe.path);
  if (token) req = req.set(auth(token));
  for (const [k, v] of Object.entries(probe.headers ?? {})) req = req.set(k, v);
  const res = await (probe.body === undefined ? req : req.send(probe.body as object));
  const text = Buffer.isBuffer(res.body)
    ? res.body.toString('latin1')
    : (res.text ?? JSON.stringify(res.body));
  return { status: res.status, text };
}

async function pushAs(token: string, mutations: Mutation[]) {
  const res = await request(ctx.app).post('/api/sync/push').set(auth(token)).send(pushBody(mutations));
  expect(res.status).toBe(200);
  return res.body as { results: { status: string }[] };
}

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  A = await makeClinic('Clinic A');
  B = await makeClinic('Clinic B');
  tokensA = await tokensFor(ctx.app, A);
  tokensB = await tokensFor(ctx.app, B);

  const blobStore = new LocalDiskBlobStore(fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-cross-')));
  const clip = await storeClip(blobStore, A.id, burstWav([0.5, 1.5], 1 + Math.floor(Math.random() * 30000)));
  a.clipSha256 = clip.sha256;
  a.clientId = await addClient(A.id, CLIENT.first, CLIENT.last, CLIENT.email);
  a.otherSessionId = await addSession({
    clinicId: A.id,
    clientId: a.clientId,
    startedAt: new Date('2026-09-01T09:00:00Z'),
  });
  a.sessionId = await addSession({
    clinicId: A.id,
    clientId: a.clientId,
    operatorId: A.users.operator.id,
    startedAt: new Date(Date.now() - 86_400_000),
    sites: { mitral: { heartRateBpm: 70, clip }, aortic: { heartRateBpm: 71 } },
  });
  await ctx.sequelize.query(`UPDATE recording_sessions SET follow_up_date = current_date WHERE id = :id`, {
    replacements: { id: a.sessionId },
  });

  const report = await request(ctx.app)
    .post(`/api/review/sessions/${a.sessionId}/report-mails`)
    .set(auth(tokensA.practitioner))
    .send({});
  expect(report.status).toBe(201);
  a.reportMailId = report.body.mail.id;
  a.reportMessageId = messagesTo(fakes.mail, CLIENT.email).at(-1)!.id;

  const invited = await request(ctx.app)
    .post('/api/team/invitations')
    .set(auth(tokensA.admin))
    .send({ email: a.invitationEmail, name: 'Joiner of A', role: 'admin' });
  expect(invited.status).toBe(201);
  a.invitationId = invited.body.invitation.id;
  const link = linkIn(messagesTo(fakes.mail, a.invitationEmail).at(-1)!.text, /\/invite\/[A-Za-z0-9_~-]+/);
  a.invitationToken = link.slice('/invite/'.length);

  // A conflict of A's: two phones change the same client on the same version.
  const created = await pushAs(tokensA.operator, [
    {
      mutationId: randomUUID(),
      entity: 'clients',
      id: a.syncedClientId,
      baseVersion: 0,
      change: { ...clientFields('A'), lastName: CLIENT.last },
    },
  ]);
  expect(created.results[0].status).toBe('applied');
  await pushAs(tokensA.operator, [updateOf(a.syncedClientId, 1, 'PhoneOne')]);
  await pushAs(tokensA.operator, [updateOf(a.syncedClientId, 1, 'PhoneTwo')]);
  const conflicts = await request(ctx.app).get('/api/admin/conflicts').set(auth(tokensA.admin));
  a.conflictId = conflicts.body.conflicts[0].id;

  await request(ctx.app)
    .post('/api/consent-texts')
    .set(auth(tokensA.admin))
    .send({ title: CONSENT_TITLE, body: 'A' });

  const settings = await request(ctx.app).get('/api/settings').set(auth(tokensA.admin));
  const offers = [{ id: 'visit', label: 'One visit', visits: 1, amountCents: 4500 }];
  expect(
    (
      await request(ctx.app)
        .put('/api/settings')
        .set(auth(tokensA.admin))
        .send(clinicSettingsSchema.parse({ ...settings.body, offers }))
    ).status,
  ).toBe(200);
  const payment = await request(ctx.app)
    .post('/api/billing/payments')
    .set(auth(tokensA.admin))
    .send({ clientId: a.clientId, offerId: 'visit', sendEmail: false });
  expect(payment.status).toBe(201);
  a.paymentId = payment.body.payment.id;
  a.checkoutId = payment.body.payment.checkoutId ?? '';

  const upload = await request(ctx.app)
    .post('/api/sync/uploads')
    .set(auth(tokensA.operator))
    .set(tus)
    .set('upload-length', '64')
    .set('upload-metadata', `sha256 ${Buffer.from('ab'.repeat(32)).toString('base64')}`);
  expect(upload.status).toBe(201);
  a.uploadId = decodeURIComponent(upload.headers.location.split('/').pop()!);
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

const rolesFor = (route: RouteSpec): Role[] =>
  route.access === 'public' ? ['admin'] : roles.filter((r) => (route.access as readonly Role[]).includes(r));

describe.each(accessTable.map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))(
  '%s',
  (_name, route) => {
    const crossCase = cases[`${route.method} ${route.path}`];
    if (!crossCase || 'notClinicData' in crossCase) {
      test.skip(
        crossCase ? `holds no clinic data: ${crossCase.notClinicData}` : 'has no case (the last test fails)',
        () => {},
      );
      return;
    }
    test.each(rolesFor(route).map((r) => [r]))(
      'when clinic B’s %s calls it, then nothing of clinic A’s comes back or changes',
      async (role) => {
        const before = await fingerprintOfA();
        const answer = await send(route, crossCase.probe(), tokensB[role]);
        expect(answer.status).toBeLessThan(500);
        if (!crossCase.showsA) for (const marker of markersOfA()) expect(answer.text).not.toContain(marker);
        if (crossCase.namesA) {
          const unknown = await send(route, crossCase.namesA.unknown(), tokensB[role]);
          expect(answer).toEqual(unknown);
          expect(answer.status).toBeGreaterThanOrEqual(400);
        }
        await crossCase.extra?.(answer, role);
        expect(await fingerprintOfA()).toEqual(before);
      },
    );
  },
);

describe('invitations and uploads across clinics', () => {
  test('when B’s admin uses A’s invitation link with any address but the invited one, then no account is made in either clinic', async () => {
    for (const email of [B.users.admin.email, `someone.${randomUUID().slice(0, 6)}@clinic-b.test`]) {
      const res = await request(ctx.app)
        .post(`/api/invitations/${a.invitationToken}/accept`)
        .set(auth(tokensB.admin))
        .send({ email, name: 'Not invited', password: 'not invited password' });
      expect(res.status).toBe(403);
    }
    const users = (await ctx.sequelize.query(`SELECT clinic_id FROM users WHERE name = 'Not invited'`, {
      type: 'SELECT',
    })) as unknown[];
    expect(users).toEqual([]);
    const team = await request(ctx.app).get('/api/team').set(auth(tokensA.admin));
    expect(team.body.invitations.find((i: { id: string }) => i.id === a.invitationId).status).toBe('pending');
  });

  test('when B has probed A’s upload, then A can still resume it where it was', async () => {
    const head = await request(ctx.app)
      .head(`/api/sync/uploads/${a.uploadId}`)
      .set(auth(tokensA.operator))
      .set(tus);
    expect(head.status).toBe(200);
    expect(head.headers['upload-offset']).toBe('0');
  });
});

describe('the cases and the table', () => {
  test('when a route is in the access table, then it has a cross-clinic case, and every case names a route', () => {
    const declared = accessTable.map((r) => `${r.method} ${r.path}`);
    expect(declared.filter((k) => !(k in cases))).toEqual([]);
    expect(Object.keys(cases).filter((k) => !declared.includes(k))).toEqual([]);
  });

  test('when a case lets an answer hold something of A’s, then it is only the invitation link and the hash B sent', () => {
    const showing = Object.entries(cases)
      .filter(([, c]) => 'showsA' in c && c.showsA)
      .map(([k]) => k);
    expect(showing.sort()).toEqual(['get /api/invitations/:token', 'get /api/sync/blobs/:sha256']);
  });

  test('when a case says a route holds no clinic data, then the route is public or is the caller’s own sign-in', () => {
    const exempt = Object.entries(cases)
      .filter(([, c]) => 'notClinicData' in c)
      .map(([k]) => k);
    expect(exempt.sort()).toEqual(
      [
        'get /api/health',
        'get /api/health/live',
        'get /api/health/ready',
        'post /api/auth/sign-in',
        'post /api/auth/refresh',
        'post /api/auth/sign-out',
      ].sort(),
    );
  });
});
