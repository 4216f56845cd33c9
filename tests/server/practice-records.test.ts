import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { clientCautionParagraphs } from '@/shared/cautions';
import { sealClip } from '@/shared/seal';
import { runFollowUpReminders } from '@/sync-server/src/jobs/follow-up-reminders';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { folderStaging } from '@/sync-server/src/services/tus-uploads';
import { purgeErased } from '@/sync-server/src/use-cases/clients/erase-client';
import { startPracticeFakes, messagesTo, type PracticeFakes } from './helpers/practice-fakes';
import { insertClient, insertSession, isoDay } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext(
  {},
  {
    services: {
      clinicKeys: new ClinicKeyStore(fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-keys-'))),
      staging: folderStaging(fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-uploads-'))),
    },
  },
);
let fakes: PracticeFakes;
let clinic: TestClinic;
let tokens: Record<'operator' | 'practitioner' | 'admin', string>;

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  ctx.services.blobStore = new LocalDiskBlobStore(fakes.blobDir);
  clinic = await makeClinic('Records');
  tokens = await tokensFor(ctx.app, clinic);
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

const q = <T>(sql: string, replacements: Record<string, unknown> = {}) =>
  ctx.sequelize.query(sql, { replacements, type: 'SELECT' }) as Promise<T[]>;
const as = (role: keyof typeof tokens) => ({ authorization: `Bearer ${tokens[role]}` });

/** A 16-bit mono PCM WAV (RIFF layout as in the Microsoft/IBM RIFF specification, 1991). */
function wav(seconds: number, rate = 4000): Buffer {
  const samples = Math.round(seconds * rate);
  const b = Buffer.alloc(44 + samples * 2);
  b.write('RIFF', 0);
  b.writeUInt32LE(36 + samples * 2, 4);
  b.write('WAVEfmt ', 8);
  b.writeUInt32LE(16, 16);
  b.writeUInt16LE(1, 20);
  b.writeUInt16LE(1, 22);
  b.writeUInt32LE(rate, 24);
  b.writeUInt32LE(rate * 2, 28);
  b.writeUInt16LE(2, 32);
  b.writeUInt16LE(16, 34);
  b.write('data', 36);
  b.writeUInt32LE(samples * 2, 40);
  for (let i = 0; i < samples; i++)
    b.writeInt16LE(Math.round(8000 * Math.sin((2 * Math.PI * 50 * i) / rate)), 44 + i * 2);
  return b;
}

async function recordedClient() {
  const clientId = await insertClient(ctx.sequelize, clinic.id);
  const sessionId = await insertSession(ctx.sequelize, clinic.id, clientId, {
    findings: 'Clear recordings at all four sites.',
    status: 'reviewed',
  });
  const plain = wav(1);
  const sealed = sealClip(plain, ctx.services.clinicKeys.publicKey(clinic.id));
  const stored = await ctx.services.blobStore.put(sealed);
  await ctx.sequelize.query(
    `INSERT INTO clip_blobs (sha256, clinic_id, size_bytes, content_type, storage_key, state) VALUES (:sha, :clinicId, :size, 'application/octet-stream', :key, 'stored')`,
    {
      replacements: {
        sha: stored.sha256,
        clinicId: clinic.id,
        size: stored.sizeBytes,
        key: stored.storageKey,
      },
    },
  );
  await ctx.sequelize.query(
    `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, clip_sha256, clip_state, duration_s, recorded_at, analysis)
     VALUES (:id, :clinicId, :sessionId, 'mitral', 'good', :sha, 'stored', 1, now(), CAST(:analysis AS jsonb))`,
    {
      replacements: {
        id: randomUUID(),
        clinicId: clinic.id,
        sessionId,
        sha: stored.sha256,
        analysis: JSON.stringify({ heartRateBpm: 71.5, sdnnMs: 42, trace: Array(50).fill(0) }),
      },
    },
  );
  return { clientId, sessionId, plain, storageKey: stored.storageKey };
}

describe('follow-up reminders', () => {
  test('when the reminder job runs twice, then the client gets exactly one e-mail for the follow-up date', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    await insertSession(ctx.sequelize, clinic.id, clientId, { followUpDate: isoDay(2) });
    const [{ email }] = await q<{ email: string }>(`SELECT email FROM clients WHERE id = :clientId`, {
      clientId,
    });
    const mail = ctx.services.mail;
    const first = await runFollowUpReminders(ctx.sequelize, mail, { clinicId: clinic.id });
    const second = await runFollowUpReminders(ctx.sequelize, mail, { clinicId: clinic.id });
    expect(first.sent).toBeGreaterThanOrEqual(1);
    expect(second).toEqual({ queued: 0, sent: 0, failed: 0 });
    const received = messagesTo(fakes.mail, email);
    expect(received).toHaveLength(1);
    expect(received[0].subject).toContain('follow-up');
    expect(received[0].text).toContain('not a diagnostic device');
  });

  test('when two job runs start at the same moment, then still only one e-mail goes out', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    await insertSession(ctx.sequelize, clinic.id, clientId, { followUpDate: isoDay(1) });
    const [{ email }] = await q<{ email: string }>(`SELECT email FROM clients WHERE id = :clientId`, {
      clientId,
    });
    const mail = ctx.services.mail;
    await Promise.all([
      runFollowUpReminders(ctx.sequelize, mail, { clinicId: clinic.id }),
      runFollowUpReminders(ctx.sequelize, mail, { clinicId: clinic.id }),
    ]);
    expect(messagesTo(fakes.mail, email)).toHaveLength(1);
  });

  test('when the mail relay defers a reminder, then it stays pending and the next run sends it once', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    await insertSession(ctx.sequelize, clinic.id, clientId, { followUpDate: isoDay(0) });
    const [{ email }] = await q<{ email: string }>(`SELECT email FROM clients WHERE id = :clientId`, {
      clientId,
    });
    fakes.mail.deferNext(1);
    const first = await runFollowUpReminders(ctx.sequelize, ctx.services.mail, { clinicId: clinic.id });
    expect(first.failed).toBe(1);
    const [row] = await q<{ status: string }>(
      `SELECT status FROM follow_up_reminders WHERE client_id = :clientId`,
      { clientId },
    );
    expect(row.status).toBe('pending');
    await runFollowUpReminders(ctx.sequelize, ctx.services.mail, { clinicId: clinic.id });
    expect(messagesTo(fakes.mail, email)).toHaveLength(1);
  });

  test('when a follow-up is further off than the notice period, then no reminder is made yet, but the operator sees it as due soon', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    await insertSession(ctx.sequelize, clinic.id, clientId, { followUpDate: isoDay(10) });
    await runFollowUpReminders(ctx.sequelize, ctx.services.mail, { clinicId: clinic.id });
    expect(
      await q(`SELECT 1 FROM follow_up_reminders WHERE client_id = :clientId`, { clientId }),
    ).toHaveLength(0);
    const due = await request(ctx.app).get('/api/follow-ups/due?withinDays=14').set(as('operator'));
    expect(due.status).toBe(200);
    expect(due.body.due.find((d: { clientId: string }) => d.clientId === clientId)).toMatchObject({
      daysUntil: 10,
      reminderStatus: 'none',
    });
  });
  test('when the client came back before an earlier follow-up date, then neither the due list nor the client table shows that date', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    const day = 24 * 60 * 60 * 1000;
    await insertSession(ctx.sequelize, clinic.id, clientId, {
      startedAt: new Date(Date.now() - 20 * day),
      followUpDate: isoDay(5),
    });
    await insertSession(ctx.sequelize, clinic.id, clientId, { startedAt: new Date(Date.now() - day) });
    const due = await request(ctx.app).get('/api/follow-ups/due?withinDays=14').set(as('operator'));
    expect(due.body.due.map((d: { clientId: string }) => d.clientId)).not.toContain(clientId);
    const record = await request(ctx.app).get(`/api/client-records/${clientId}`).set(as('admin'));
    expect(record.body.client.nextFollowUp).toBeNull();
  });
});

describe('audit log', () => {
  test('when a client record is read, then the read is in the audit log with who, when and from where', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    expect(
      (await request(ctx.app).get(`/api/client-records/${clientId}`).set(as('practitioner'))).status,
    ).toBe(200);
    const log = await request(ctx.app)
      .get(`/api/audit?action=client.read&entityId=${clientId}`)
      .set(as('admin'));
    expect(log.status).toBe(200);
    expect(log.body.events).toEqual([
      expect.objectContaining({
        action: 'client.read',
        userId: clinic.users.practitioner.id,
        entity: 'client',
        ip: expect.any(String),
      }),
    ]);
  });

  test('when anyone tries to change or remove an audit row, then neither the API nor the database allows it', async () => {
    const log = await request(ctx.app).get('/api/audit').set(as('admin'));
    const id = log.body.events[0].id;
    for (const method of ['put', 'patch', 'delete'] as const) {
      const agent = request(ctx.app);
      const res = await agent[method](`/api/audit/${id}`).set(as('admin')).send({ action: 'nothing' });
      expect(res.status).toBe(404);
    }
    await expect(
      ctx.sequelize.query(`UPDATE audit_events SET action = 'edited' WHERE id = :id`, {
        replacements: { id },
      }),
    ).rejects.toThrow(/append-only/);
    await expect(
      ctx.sequelize.query(`DELETE FROM audit_events WHERE id = :id`, { replacements: { id } }),
    ).rejects.toThrow(/append-only/);
  });

  test('when a practitioner asks for the audit log, then it is refused', async () => {
    expect((await request(ctx.app).get('/api/audit').set(as('practitioner'))).status).toBe(403);
  });
});

describe('client records', () => {
  test('when two people edit the same client, then the second, stale edit is refused and loses nothing of the first', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    const rec = (await request(ctx.app).get(`/api/client-records/${clientId}`).set(as('admin'))).body;
    const base = {
      firstName: rec.client.firstName,
      lastName: rec.client.lastName,
      version: rec.client.version,
    };
    const first = await request(ctx.app)
      .patch(`/api/client-records/${clientId}`)
      .set(as('admin'))
      .send({ ...base, phone: '555-0101' });
    expect(first.status).toBe(200);
    expect(first.body.client.version).toBe(base.version + 1);
    const stale = await request(ctx.app)
      .patch(`/api/client-records/${clientId}`)
      .set(as('practitioner'))
      .send({ ...base, phone: '555-0199' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_edit');
    const now = (await request(ctx.app).get(`/api/client-records/${clientId}`).set(as('admin'))).body;
    expect(now.client.phone).toBe('555-0101');
  });

  test('when the client table is searched, sorted and paged, then it answers one page with the total', async () => {
    const last = `Pager${randomUUID().slice(0, 6)}`;
    for (const first of ['Cyd', 'Abe', 'Bea']) await insertClient(ctx.sequelize, clinic.id, { first, last });
    const res = await request(ctx.app)
      .get(`/api/client-records?q=${last}&sort=name&dir=asc&page=1&pageSize=2`)
      .set(as('admin'));
    expect(res.status).toBe(200);
    expect(res.body.pageInfo).toEqual({ page: 1, pageSize: 2, total: 3 });
    expect(res.body.clients.map((c: { firstName: string }) => c.firstName)).toEqual(['Abe', 'Bea']);
  });

  test('when records are older than the retention period, then the table marks them due for review, lists them alone on request, and erases nothing', async () => {
    // A clinic of its own, so its 12-month period leaves the other tests' clinic at the default.
    const own = await makeClinic('Retention');
    const ownTokens = await tokensFor(ctx.app, own);
    const asOwn = { authorization: `Bearer ${ownTokens.admin}` };
    const settings = (await request(ctx.app).get('/api/settings').set(asOwn)).body;
    const saved = await request(ctx.app)
      .put('/api/settings')
      .set(asOwn)
      .send({ ...settings, retentionMonths: 12 });
    expect(saved.status).toBe(200);
    const last = `Keep${randomUUID().slice(0, 6)}`;
    const lapsed = await insertClient(ctx.sequelize, own.id, { first: 'Lapsed', last });
    await insertSession(ctx.sequelize, own.id, lapsed, { startedAt: new Date('2019-03-02T12:00:00Z') });
    await insertSession(ctx.sequelize, own.id, lapsed, { startedAt: new Date('2020-01-15T12:00:00Z') });
    const recent = await insertClient(ctx.sequelize, own.id, { first: 'Recent', last });
    await insertSession(ctx.sequelize, own.id, recent, { startedAt: new Date('2018-05-20T12:00:00Z') });
    await insertSession(ctx.sequelize, own.id, recent, {
      startedAt: new Date(Date.now() - 300 * 86_400_000),
    });
    const neverSeen = await insertClient(ctx.sequelize, own.id, { first: 'Unseen', last });
    await ctx.sequelize.query(`UPDATE clients SET created_at = '2019-06-10T12:00:00Z' WHERE id = :id`, {
      replacements: { id: neverSeen },
    });

    const all = await request(ctx.app).get(`/api/client-records?q=${last}&sort=keepUntil`).set(asOwn);
    expect(all.status).toBe(200);
    const byName = new Map(
      all.body.clients.map((c: { firstName: string; retentionDue: boolean; keepUntil: string }) => [
        c.firstName,
        c,
      ]),
    );
    // The clock runs from the last visit (not the first), or from the day the client was added.
    expect(byName.get('Lapsed')).toMatchObject({ retentionDue: true, keepUntil: '2021-01-15' });
    expect(byName.get('Recent')).toMatchObject({ retentionDue: false });
    expect(byName.get('Unseen')).toMatchObject({ retentionDue: true, keepUntil: '2020-06-10' });
    expect(all.body.clients.map((c: { firstName: string }) => c.firstName)).toEqual([
      'Unseen',
      'Lapsed',
      'Recent',
    ]);

    const due = await request(ctx.app).get(`/api/client-records?q=${last}&retention=due`).set(asOwn);
    expect(due.body.pageInfo.total).toBe(2);
    expect(due.body.clients.map((c: { firstName: string }) => c.firstName).sort()).toEqual([
      'Lapsed',
      'Unseen',
    ]);
    const [{ count }] = await q<{ count: string }>(
      `SELECT count(*) AS count FROM clients WHERE clinic_id = :clinicId AND deleted_at IS NULL`,
      { clinicId: own.id },
    );
    expect(Number(count)).toBeGreaterThanOrEqual(3);
  });

  test('when things wait for the admin, then the overview counts them: open conflicts, undelivered reports, records past retention', async () => {
    const own = await makeClinic('Attention');
    const ownTokens = await tokensFor(ctx.app, own);
    const get = (token: string) =>
      request(ctx.app).get('/api/admin/attention').set('authorization', `Bearer ${token}`);
    expect((await get(ownTokens.admin)).body).toEqual({
      openConflicts: 0,
      undeliveredReports: 0,
      clientsPastRetention: 0,
      // Server-wide (not this clinic's): counted in tests/server/job-queue.test.ts.
      failingBackgroundTasks: expect.any(Number),
    });

    const clientId = await insertClient(ctx.sequelize, own.id);
    const sessionId = await insertSession(ctx.sequelize, own.id, clientId, {
      startedAt: new Date('2015-03-02T12:00:00Z'),
    });
    const conflict = `INSERT INTO sync_conflicts (id, clinic_id, entity, row_id, server_version, client_version, status)
      VALUES (:id, :clinicId, 'clients', :rowId, '{}'::jsonb, '{}'::jsonb, :status)`;
    for (const status of ['open', 'open', 'resolved'])
      await ctx.sequelize.query(conflict, {
        replacements: { id: randomUUID(), clinicId: own.id, rowId: clientId, status },
      });
    const mail = `INSERT INTO report_mails (id, clinic_id, session_id, to_address, subject, body_text, attachment_name, attachment, state, attempts, next_attempt_at)
      VALUES (:id, :clinicId, :sessionId, 'x@example.test', 'Report', 'Body', 'r.pdf', ''::bytea, :state, 1, :next)`;
    // Refused for good, waiting for a retry by the server, and delivered: only the first waits for a person.
    for (const [state, next] of [
      ['failed', null],
      ['failed', new Date(Date.now() + 60_000)],
      ['sent', null],
    ] as const)
      await ctx.sequelize.query(mail, {
        replacements: { id: randomUUID(), clinicId: own.id, sessionId, state, next },
      });

    const counts = await get(ownTokens.admin);
    expect(counts.status).toBe(200);
    // The 2015 visit is past the default seven years.
    expect(counts.body).toEqual({
      openConflicts: 2,
      undeliveredReports: 1,
      clientsPastRetention: 1,
      failingBackgroundTasks: expect.any(Number),
    });
    // Another clinic's admin sees its own (empty) counts; a practitioner may not ask.
    expect((await get((await tokensFor(ctx.app, await makeClinic('Elsewhere'))).admin)).body).toEqual({
      openConflicts: 0,
      undeliveredReports: 0,
      clientsPastRetention: 0,
      // Server-wide (not this clinic's): counted in tests/server/job-queue.test.ts.
      failingBackgroundTasks: expect.any(Number),
    });
    expect((await get(ownTokens.practitioner)).status).toBe(403);
  });

  test('when a new consent text is published, then it gets the next version and becomes the current one', async () => {
    const a = await request(ctx.app)
      .post('/api/consent-texts')
      .set(as('admin'))
      .send({ title: 'Recording consent', body: 'I agree to heart-sound recording.' });
    const b = await request(ctx.app)
      .post('/api/consent-texts')
      .set(as('admin'))
      .send({ title: 'Recording consent', body: 'Revised wording.' });
    expect(b.body.text.version).toBe(a.body.text.version + 1);
    const list = await request(ctx.app).get('/api/consent-texts').set(as('operator'));
    expect(
      list.body.texts.filter((t: { isCurrent: boolean }) => t.isCurrent).map((t: { id: string }) => t.id),
    ).toEqual([b.body.text.id]);
  });
});

describe('export and erasure', () => {
  test('when the admin exports a client, then the zip holds the CSVs, the clip as the WAV recorded, and the report', async () => {
    const { clientId, plain } = await recordedClient();
    const res = await request(ctx.app)
      .get(`/api/client-records/${clientId}/export`)
      .set(as('admin'))
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-export-'));
    const zipFile = path.join(dir, 'export.zip');
    fs.writeFileSync(zipFile, res.body as Buffer);
    // Debian's Info-ZIP unzip reads the archive: an outside check that the zip is well formed.
    execFileSync('unzip', ['-q', zipFile, '-d', dir]);
    const listing = fs.readdirSync(dir, { recursive: true }).map(String).sort();
    expect(listing).toEqual(
      expect.arrayContaining(['client.csv', 'consents.csv', 'visits.csv', 'measurements.csv', 'README.txt']),
    );
    const wavName = listing.find((f) => f.startsWith('clips/') && f.endsWith('.wav'))!;
    expect(fs.readFileSync(path.join(dir, wavName)).equals(plain)).toBe(true);
    const reportName = listing.find((f) => f.startsWith('reports/') && f.endsWith('.pdf'))!;
    // pdftotext from Debian's poppler-utils reads the text layer back: the full report, as downloaded.
    const report = execFileSync('/usr/bin/pdftotext', ['-layout', path.join(dir, reportName), '-'], {
      encoding: 'utf8',
    }).replace(/\s+/g, ' ');
    expect(report).toContain('Clear recordings at all four sites.');
    // The client's report shows the ranges; it cites only sources that are not from memory, and the demo's
    // heart-rate range is one recalled from public guidance, so it carries no footnote there.
    expect(report).toContain('Heart rate (bpm) 60–100');
    expect(report).toContain(clientCautionParagraphs[0].slice(0, 60));
    const measurements = fs.readFileSync(path.join(dir, 'measurements.csv'), 'utf8');
    expect(measurements).toContain('mitral');
    expect(measurements).toContain('heartRateBpm,71.5');
    expect(measurements).not.toContain('trace');
    expect(fs.readFileSync(path.join(dir, 'visits.csv'), 'utf8')).toContain(
      'Clear recordings at all four sites.',
    );
    const log = await request(ctx.app)
      .get(`/api/audit?action=client.export&entityId=${clientId}`)
      .set(as('admin'));
    expect(log.body.events).toHaveLength(1);
  });

  test('when an operator asks for an export, then it is refused', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    expect(
      (await request(ctx.app).get(`/api/client-records/${clientId}/export`).set(as('operator'))).status,
    ).toBe(403);
  });

  test('when the admin erases a client, then rows are tombstoned without personal data, the clip is deleted, devices see the tombstones, and the log keeps only the fact', async () => {
    const { clientId, sessionId, storageKey } = await recordedClient();
    const [{ first_name, last_name, seq: seqBefore }] = await q<{
      first_name: string;
      last_name: string;
      seq: string;
    }>(`SELECT first_name, last_name, change_seq AS seq FROM clients WHERE id = :clientId`, { clientId });
    const wrong = await request(ctx.app)
      .post(`/api/client-records/${clientId}/erase`)
      .set(as('admin'))
      .send({ confirmName: 'Someone Else' });
    expect(wrong.status).toBe(400);

    const res = await request(ctx.app)
      .post(`/api/client-records/${clientId}/erase`)
      .set(as('admin'))
      .send({ confirmName: `${first_name} ${last_name}` });
    expect(res.status).toBe(200);
    expect(res.body.blobsDeleted).toBe(1);
    expect(fs.existsSync(path.join(fakes.blobDir, storageKey))).toBe(false);

    const [client] = await q<{
      deleted_at: Date | null;
      first_name: string;
      email: string | null;
      seq: string;
    }>(`SELECT deleted_at, first_name, email, change_seq AS seq FROM clients WHERE id = :clientId`, {
      clientId,
    });
    expect(client.deleted_at).not.toBeNull();
    expect(client.first_name).toBe('erased');
    expect(client.email).toBeNull();
    expect(BigInt(client.seq)).toBeGreaterThan(BigInt(seqBefore));
    const [session] = await q<{ deleted_at: Date | null; findings: string | null }>(
      `SELECT deleted_at, findings FROM recording_sessions WHERE id = :sessionId`,
      { sessionId },
    );
    expect(session.deleted_at).not.toBeNull();
    expect(session.findings).toBeNull();

    expect((await request(ctx.app).get(`/api/client-records/${clientId}`).set(as('admin'))).status).toBe(404);
    const log = await request(ctx.app)
      .get(`/api/audit?action=client.erase&entityId=${clientId}`)
      .set(as('admin'));
    expect(log.body.events).toHaveLength(1);
    expect(JSON.stringify(log.body.events[0])).not.toContain(first_name);

    expect(await purgeErased(ctx, { graceMs: 0, clinicId: clinic.id })).toBeGreaterThanOrEqual(1);
    expect(await q(`SELECT 1 FROM clients WHERE id = :clientId`, { clientId })).toHaveLength(0);
    expect(await q(`SELECT 1 FROM recording_sessions WHERE id = :sessionId`, { sessionId })).toHaveLength(0);
    const kept = await request(ctx.app)
      .get(`/api/audit?action=client.erase&entityId=${clientId}`)
      .set(as('admin'));
    expect(kept.body.events).toHaveLength(1);
  });
});
