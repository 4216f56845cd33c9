import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { addDays, DOCUMENT_LOCALE, formatDay, todayIn } from '@/shared/format/dates';
import type { Role } from '@/shared/protocol';
import {
  comparisonSchema,
  reviewSessionDetailSchema,
  traceSchema,
  trendsSchema,
} from '@/shared/protocol/review';
import { cautionParagraphs, clientCautionParagraphs } from '@/shared/cautions';
import { generateClinicKeyPair, openClip, sealClip } from '@/shared/seal';
import { runReportMailRetries, SENDING_STALE_MS } from '@/sync-server/src/jobs/report-mail-retries';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { createSmtpMailService } from '@/sync-server/src/services/mail';
import { replaceServices } from '@/sync-server/src/composition-root';
import { startSmtpFake, type SmtpFake } from '@/sync-server/fakes/smtp-fake';
import { addClient, addSession, burstWav, storeClip } from './helpers/review-fixtures';
import {
  auditEventsWhere,
  makeClinic,
  makeTestContext,
  tokensFor,
  type TestClinic,
} from './helpers/test-app';

const ctx = makeTestContext();
const blobDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-review-blobs-'));
const blobStore = new LocalDiskBlobStore(blobDir);
let fake: SmtpFake;
let clinic: TestClinic;
let other: TestClinic;
let tokens: Record<Role, string>;
let otherTokens: Record<Role, string>;
let clientId: string;
let earlier: string;
let latest: string;
const onsets = [0.5, 1.5, 2.5, 3.5];
const salt = 1 + Math.floor(Math.random() * 30000);
const auth = (token: string) => ({ authorization: `Bearer ${token}` });

beforeAll(async () => {
  fake = await startSmtpFake();
  replaceServices({
    blobStore,
    mail: createSmtpMailService({
      host: '127.0.0.1',
      port: fake.smtpPort,
      from: 'reports@fourpoint.test',
      timeoutMs: 3000,
    }),
  });
  clinic = await makeClinic('Review session');
  other = await makeClinic('Other clinic');
  tokens = await tokensFor(ctx.app, clinic);
  otherTokens = await tokensFor(ctx.app, other);
  clientId = await addClient(clinic.id, 'Tamsin', 'Oakridge', 'tamsin@example.test');
  const clip = await storeClip(blobStore, clinic.id, burstWav(onsets, salt));
  const sounds = onsets.map((t) => ({ type: 'S1' as const, startS: t, endS: t + 0.05 }));
  earlier = await addSession({
    clinicId: clinic.id,
    clientId,
    startedAt: new Date('2026-09-01T09:00:00Z'),
    sites: {
      mitral: {
        heartRateBpm: 64,
        clip,
        sounds,
        screen: { murmur: 'unlikely', score: 0.1, reasons: ['Quiet between the sounds'] },
      },
      aortic: { heartRateBpm: 66 },
    },
  });
  latest = await addSession({
    clinicId: clinic.id,
    clientId,
    operatorId: clinic.users.operator.id,
    startedAt: new Date('2026-11-20T09:00:00Z'),
    sites: {
      mitral: { heartRateBpm: 108, clip, sounds },
      tricuspid: { heartRateBpm: 72 },
      aortic: { heartRateBpm: 70 },
      pulmonic: { heartRateBpm: 71 },
    },
  });
});
afterAll(async () => {
  await fake.close();
  await ctx.close();
});

async function auditActions(entityId: string): Promise<string[]> {
  const rows = await auditEventsWhere({ clinicId: clinic.id, entityId });
  return rows.map((r) => r.action);
}

describe('session view', () => {
  test('when a practitioner opens a session, then four sites come with measurements against ranges in words, and the read is audited', async () => {
    const res = await request(ctx.app).get(`/api/review/sessions/${latest}`).set(auth(tokens.practitioner));
    expect(res.status).toBe(200);
    const detail = reviewSessionDetailSchema.parse(res.body);
    expect(detail.sites.map((s) => s.site)).toEqual(['mitral', 'tricuspid', 'aortic', 'pulmonic']);
    const rate = detail.sites[0].measurements.find((m) => m.key === 'heartRateBpm')!;
    // 108 bpm is above the adult resting band of 60–100 bpm (common practice, no source).
    expect(rate).toMatchObject({
      value: 108,
      status: 'above',
      reading: 'Above range: refer to a licensed clinician',
    });
    expect(rate.range?.source).toMatch(/60–100 bpm/);
    expect(detail.sites[0].referral).toBe(true);
    expect(detail.flagged).toBe(true);
    expect(detail.sites[1].measurements.find((m) => m.key === 'heartRateBpm')!.status).toBe('in_range');
    expect(await auditActions(latest)).toContain('review.session.read');
  });

  test('when the trace is asked for, then the loud buckets sit at the bursts of the clip and the S1 marks come with it', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/sites/mitral/trace`)
      .set(auth(tokens.practitioner));
    expect(res.status).toBe(200);
    const trace = traceSchema.parse(res.body);
    expect(trace.durationS).toBeCloseTo(4, 3);
    const loud = trace.max.map((v, i) => (v > 0.5 ? i / trace.bucketsPerSecond : -1)).filter((t) => t >= 0);
    for (const t of loud) expect(onsets.some((o) => t >= o - 0.02 && t <= o + 0.08)).toBe(true);
    for (const o of onsets) expect(loud.some((t) => Math.abs(t - o) < 0.06)).toBe(true);
    expect(trace.sounds.map((s) => s.startS)).toEqual(onsets);
  });

  test('when the audio is asked for, then the stored WAV comes back byte for byte and the playback is audited', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/sites/mitral/audio`)
      .set(auth(tokens.practitioner))
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/audio\/wav/);
    expect(Buffer.compare(res.body as Buffer, Buffer.from(burstWav(onsets, salt)))).toBe(0);
    expect(
      await auditActions(
        (await auditEventsWhere({ clinicId: clinic.id, action: 'review.recording.play' }))[0]!.entityId!,
      ),
    ).toContain('review.recording.play');
  });

  test('when the clip was sealed on the device, then the server opens it with the clinic key for the trace once and keeps the trace, and a wrong key is a 422 for the audio', async () => {
    const keys = generateClinicKeyPair();
    const plain = burstWav([1, 2], salt + 1);
    const sealedClip = await storeClip(blobStore, clinic.id, sealClip(plain, keys.publicKey));
    const session = await addSession({
      clinicId: clinic.id,
      clientId: await addClient(clinic.id, 'Sela', 'Sealed'),
      startedAt: new Date('2026-10-10T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 70, clip: sealedClip } },
    });
    replaceServices({ openClip: async (_clinicId, sealed) => openClip(sealed, keys.privateKey) });
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${session}/sites/mitral/trace`)
      .set(auth(tokens.practitioner));
    expect(res.status).toBe(200);
    expect(traceSchema.parse(res.body).durationS).toBeCloseTo(4, 3);
    replaceServices({
      openClip: async (_clinicId, sealed) => openClip(sealed, generateClinicKeyPair().privateKey),
    });
    // The trace was kept with the clip on first view: drawing it again does not open the clip.
    const kept = await request(ctx.app)
      .get(`/api/review/sessions/${session}/sites/mitral/trace`)
      .set(auth(tokens.practitioner));
    expect(kept.status).toBe(200);
    expect(kept.body).toEqual(res.body);
    const wrong = await request(ctx.app)
      .get(`/api/review/sessions/${session}/sites/mitral/audio`)
      .set(auth(tokens.practitioner));
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.code).toBe('clip_unopenable');
  });

  test('when a site has no clip, then trace and audio answer 404 with a message', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/sites/tricuspid/trace`)
      .set(auth(tokens.practitioner));
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe('This site has no clip.');
  });

  test('when a stored analysis does not read as one, then the session still opens and the site says so in words', async () => {
    const session = await addSession({
      clinicId: clinic.id,
      clientId: await addClient(clinic.id, 'Una', 'Readable'),
      startedAt: new Date('2026-10-11T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 70 } },
    });
    await ctx.sequelize.query(
      `UPDATE site_recordings SET analysis = '{"heartRateBpm": "fast"}'::jsonb WHERE session_id = :session`,
      { replacements: { session } },
    );
    const res = await request(ctx.app).get(`/api/review/sessions/${session}`).set(auth(tokens.practitioner));
    expect(res.status).toBe(200);
    const mitral = reviewSessionDetailSchema.parse(res.body).sites[0];
    expect(mitral.qualityReasons).toEqual([
      expect.stringMatching(/analysis kept for this site cannot be read/),
    ]);
    expect(mitral.measurements.every((m) => m.status === 'no_value')).toBe(true);
  });

  test('when earlier visits and a comparison are asked for, then the change is now minus then and S1 onsets align the traces', async () => {
    const visits = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/earlier`)
      .set(auth(tokens.practitioner));
    expect(visits.body.visits.map((v: { id: string }) => v.id)).toEqual([earlier]);
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/compare/${earlier}`)
      .set(auth(tokens.practitioner));
    const comparison = comparisonSchema.parse(res.body);
    const rate = comparison.rows.find((r) => r.site === 'mitral' && r.key === 'heartRateBpm')!;
    expect(rate).toMatchObject({ then: 64, now: 108, change: 44 });
    expect(comparison.rows.find((r) => r.site === 'tricuspid' && r.key === 'heartRateBpm')).toMatchObject({
      then: null,
      now: 72,
      change: null,
    });
    expect(comparison.firstS1.find((f) => f.site === 'mitral')).toEqual({
      site: 'mitral',
      now: 0.5,
      then: 0.5,
    });
  });

  test('when trends are asked for, then each site and measurement has one point per visit in date order with the range', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/clients/${clientId}/trends`)
      .set(auth(tokens.practitioner));
    const trends = trendsSchema.parse(res.body);
    const rate = trends.series.find((s) => s.site === 'mitral' && s.key === 'heartRateBpm')!;
    expect(rate.points.map((p) => [p.value, p.status])).toEqual([
      [64, 'in_range'],
      [108, 'above'],
    ]);
    expect(rate.range).toMatchObject({ low: 60, high: 100 });
  });

  test('when trends are asked for, then each visit brings its murmur screen per recorded site, and none where its analysis had none', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/clients/${clientId}/trends`)
      .set(auth(tokens.practitioner));
    const { murmurScreens } = trendsSchema.parse(res.body);
    const mitral = murmurScreens.filter((m) => m.site === 'mitral');
    expect(mitral.map((m) => [m.sessionId, m.screen?.murmur ?? null])).toEqual([
      [earlier, 'unlikely'],
      [latest, null],
    ]);
    expect(murmurScreens.filter((m) => m.sessionId === earlier).map((m) => m.site)).toEqual([
      'mitral',
      'aortic',
    ]);
  });
});

describe('findings, plan and follow-up', () => {
  // The demo and test clinics keep the default zone, UTC, until an admin chooses one.
  const today = todayIn('UTC');
  const inTwoWeeks = addDays(today, 14);

  test('a follow-up date is a day after today at the clinic: today and earlier days are refused in words', async () => {
    const detail = reviewSessionDetailSchema.parse(
      (await request(ctx.app).get(`/api/review/sessions/${latest}`).set(auth(tokens.practitioner))).body,
    );
    for (const day of [today, addDays(today, -30)]) {
      const refused = await request(ctx.app)
        .put(`/api/review/sessions/${latest}/notes`)
        .set(auth(tokens.practitioner))
        .send({ findings: null, plan: null, followUpDate: day, baseVersion: detail.notes.version });
      expect(refused.status).toBe(400);
      expect(refused.body.error.code).toBe('follow_up_not_after_today');
      expect(refused.body.error.message).toMatch(/after today/);
    }
  });

  test('when saved on the version read, then the version moves on and the save is audited; a save on the old version is a 409 with both', async () => {
    const detail = reviewSessionDetailSchema.parse(
      (await request(ctx.app).get(`/api/review/sessions/${latest}`).set(auth(tokens.practitioner))).body,
    );
    const base = detail.notes.version;
    const first = await request(ctx.app)
      .put(`/api/review/sessions/${latest}/notes`)
      .set(auth(tokens.practitioner))
      .send({
        findings: 'Rate high at mitral.',
        plan: 'Repeat in 4 weeks.',
        followUpDate: inTwoWeeks,
        baseVersion: base,
      });
    expect(first.status).toBe(200);
    expect(first.body.notes).toMatchObject({
      findings: 'Rate high at mitral.',
      version: base + 1,
      followUpDate: inTwoWeeks,
    });

    const stale = await request(ctx.app)
      .put(`/api/review/sessions/${latest}/notes`)
      .set(auth(tokens.practitioner))
      .send({ findings: 'Something else', plan: null, followUpDate: null, baseVersion: base });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_edit');
    expect(stale.body.error.details.current).toMatchObject({
      findings: 'Rate high at mitral.',
      version: base + 1,
    });
    expect(stale.body.error.details.yours).toMatchObject({ findings: 'Something else', baseVersion: base });
    const after = reviewSessionDetailSchema.parse(
      (await request(ctx.app).get(`/api/review/sessions/${latest}`).set(auth(tokens.practitioner))).body,
    );
    expect(after.notes.findings).toBe('Rate high at mitral.');
    expect(after.status).toBe('reviewed');
    expect((await auditActions(latest)).filter((a) => a === 'review.findings.save')).toHaveLength(1);
  });

  test('when the body is malformed, then it is a 400 and nothing changes', async () => {
    const res = await request(ctx.app)
      .put(`/api/review/sessions/${latest}/notes`)
      .set(auth(tokens.practitioner))
      .send({ findings: 'x', plan: null, followUpDate: '18/12/2026', baseVersion: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/followUpDate: Use a real date written like 2026-03-31/);
  });
});

describe('roles and clinics', () => {
  test('when an operator asks for a session, its findings or its report, then each is a 403', async () => {
    for (const url of [
      `/api/review/sessions/${latest}`,
      `/api/review/sessions/${latest}/report`,
      `/api/review/sessions/${latest}/sites/mitral/audio`,
    ]) {
      expect((await request(ctx.app).get(url).set(auth(tokens.operator))).status).toBe(403);
    }
    const save = await request(ctx.app)
      .put(`/api/review/sessions/${latest}/notes`)
      .set(auth(tokens.operator))
      .send({ findings: 'x', plan: null, followUpDate: null, baseVersion: 1 });
    expect(save.status).toBe(403);
  });

  test('when an admin tries to write findings or send a report, then it is a 403; reading is allowed', async () => {
    expect(
      (await request(ctx.app).get(`/api/review/sessions/${latest}`).set(auth(tokens.admin))).status,
    ).toBe(200);
    expect(
      (
        await request(ctx.app)
          .post(`/api/review/sessions/${latest}/report-mails`)
          .set(auth(tokens.admin))
          .send({})
      ).status,
    ).toBe(403);
  });

  test('when another clinic asks for this clinic’s session, clip, comparison, trends or report, then it is a 404 and nothing leaks', async () => {
    for (const url of [
      `/api/review/sessions/${latest}`,
      `/api/review/sessions/${latest}/sites/mitral/audio`,
      `/api/review/sessions/${latest}/sites/mitral/trace`,
      `/api/review/sessions/${latest}/compare/${earlier}`,
      `/api/review/sessions/${latest}/report`,
      `/api/review/clients/${clientId}/trends`,
    ]) {
      const res = await request(ctx.app).get(url).set(auth(otherTokens.practitioner));
      expect(res.status).toBe(404);
      expect(JSON.stringify(res.body)).not.toMatch(/Tamsin|Oakridge/);
    }
    const save = await request(ctx.app)
      .put(`/api/review/sessions/${latest}/notes`)
      .set(auth(otherTokens.practitioner))
      .send({ findings: 'x', plan: null, followUpDate: null, baseVersion: 1 });
    expect(save.status).toBe(404);
  });
});

describe('report', () => {
  test('when the PDF is downloaded, then its text holds the clinic, client, the out-of-range wording and the cautions', async () => {
    const res = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/report`)
      .query({ compareWith: earlier })
      .set(auth(tokens.practitioner))
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/fourpoint-report-tamsin-oakridge-2026-11-20\.pdf/);
    const file = path.join(os.tmpdir(), `review-report-${Date.now()}.pdf`);
    fs.writeFileSync(file, res.body as Buffer);
    // pdftotext from Debian's poppler-utils reads the text layer back.
    const text = execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(
      /\s+/g,
      ' ',
    );
    expect(text).toContain(clinic.name);
    expect(text).toContain('Tamsin Oakridge');
    // The client's report words a referral for the client, without the practitioner-only sentences.
    expect(text).toContain('Above the usual range: please see a licensed clinician');
    expect(text).not.toContain('scope of your licence');
    // Dates on the report are written one way (the document locale, the clinic's zone: UTC for this clinic).
    expect(text).toContain(
      `Compared with the visit of ${formatDay('2026-09-01', { locale: DOCUMENT_LOCALE, timeZone: 'UTC' })}`,
    );
    expect(text).toContain('Rate high at mitral.');
    for (const p of clientCautionParagraphs) expect(text).toContain(p.slice(0, 60));
  });
});

describe('report by e-mail', () => {
  test('when sent, then the fake relay receives it over SMTP with the PDF attached, addressed to the client', async () => {
    const res = await request(ctx.app)
      .post(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner))
      .send({ compareWith: earlier });
    expect(res.status).toBe(201);
    expect(res.body.mail).toMatchObject({ state: 'sent', to: 'tamsin@example.test', attempts: 1 });
    const listing = (await (
      await fetch(`http://127.0.0.1:${fake.httpPort}/api/messages?to=tamsin@example.test`)
    ).json()) as {
      messages: { id: string; subject: string; attachments: { contentType: string; filename: string }[] }[];
    };
    const message = listing.messages.find((m) => m.subject === res.body.mail.subject)!;
    expect(message.attachments[0]).toMatchObject({
      contentType: 'application/pdf',
      filename: 'fourpoint-report-tamsin-oakridge-2026-11-20.pdf',
    });
    const pdf = Buffer.from(
      await (
        await fetch(`http://127.0.0.1:${fake.httpPort}/api/messages/${message.id}/attachments/0`)
      ).arrayBuffer(),
    );
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const detail = (await (
      await fetch(`http://127.0.0.1:${fake.httpPort}/api/messages/${message.id}`)
    ).json()) as { text: string };
    // Written for the client (product brief, Cautions): "please see", and no sentence about the practitioner's licence.
    expect(detail.text).toContain('Please see a licensed clinician.');
    expect(detail.text).toContain(cautionParagraphs[0]);
    expect(detail.text).not.toContain('scope of your licence');
  });

  test('when the relay defers the message, then it is kept as failed with the reason, and a retry delivers it once', async () => {
    fake.deferNext(1);
    const before = fake.messages.length;
    const res = await request(ctx.app)
      .post(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner))
      .send({});
    expect(res.status).toBe(202);
    expect(res.body.mail).toMatchObject({ state: 'failed', attempts: 1 });
    expect(res.body.mail.lastError).toMatch(/451/);
    expect(fake.messages.length).toBe(before);

    const listed = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner));
    expect(listed.body.mails.find((m: { id: string }) => m.id === res.body.mail.id)).toMatchObject({
      state: 'failed',
    });

    const retry = await request(ctx.app)
      .post(`/api/review/report-mails/${res.body.mail.id}/retry`)
      .set(auth(tokens.practitioner));
    expect(retry.status).toBe(200);
    expect(retry.body.mail).toMatchObject({ state: 'sent', attempts: 2, lastError: null });
    expect(fake.messages.length).toBe(before + 1);
    expect(fake.messages[fake.messages.length - 1].attachments[0].content.subarray(0, 5).toString()).toBe(
      '%PDF-',
    );

    const again = await request(ctx.app)
      .post(`/api/review/report-mails/${res.body.mail.id}/retry`)
      .set(auth(tokens.practitioner));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_sent');
    expect(fake.messages.length).toBe(before + 1);
  });

  test('when the relay is down, then the send fails with a clear message and the message waits for a retry', async () => {
    replaceServices({
      mail: createSmtpMailService({
        host: '127.0.0.1',
        port: 1,
        from: 'reports@fourpoint.test',
        timeoutMs: 2000,
      }),
    });
    const res = await request(ctx.app)
      .post(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner))
      .send({});
    expect(res.body.mail.state).toBe('failed');
    expect(res.body.mail.lastError).toMatch(/could not be reached/);
    replaceServices({
      mail: createSmtpMailService({ host: '127.0.0.1', port: fake.smtpPort, from: 'reports@fourpoint.test' }),
    });
    const retry = await request(ctx.app)
      .post(`/api/review/report-mails/${res.body.mail.id}/retry`)
      .set(auth(tokens.practitioner));
    expect(retry.body.mail.state).toBe('sent');
  });

  test('when the client has no e-mail and none is typed, then it is a 400 that says so', async () => {
    const noMail = await addClient(clinic.id, 'Nell', 'Nomail');
    const session = await addSession({
      clinicId: clinic.id,
      clientId: noMail,
      startedAt: new Date('2026-11-01T09:00:00Z'),
    });
    const res = await request(ctx.app)
      .post(`/api/review/sessions/${session}/report-mails`)
      .set(auth(tokens.practitioner))
      .send({});
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('no_client_email');
  });
});

describe('report e-mails the server sends again by itself', () => {
  const relay = () =>
    createSmtpMailService({ host: '127.0.0.1', port: fake.smtpPort, from: 'reports@fourpoint.test' });
  const minutesFrom = (base: string, minutes: number) => new Date(Date.parse(base) + minutes * 60_000);
  const delivered = (to: string) => fake.messages.filter((m) => m.envelopeTo.includes(to)).length;
  const send = async (to: string) => {
    const res = await request(ctx.app)
      .post(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner))
      .send({ to });
    expect(res.status).toBe(202);
    return res.body.mail as { id: string; state: string; nextAttemptAt: string | null; lastError: string };
  };
  const mailState = async (id: string) => {
    const listed = await request(ctx.app)
      .get(`/api/review/sessions/${latest}/report-mails`)
      .set(auth(tokens.practitioner));
    return listed.body.mails.find((m: { id: string }) => m.id === id);
  };

  test('when the relay defers a report, then after the wait the server delivers it once, even with two runs at the same moment', async () => {
    const to = `deferred.${salt}@example.test`;
    fake.deferNext(1);
    const mail = await send(to);
    expect(mail.state).toBe('failed');
    // The first wait is one minute (our own schedule, REPORT_MAIL_RETRY_DELAYS_MS).
    const wait = Date.parse(mail.nextAttemptAt!) - Date.now();
    expect(wait).toBeGreaterThan(30_000);
    expect(wait).toBeLessThanOrEqual(60_000);

    const early = await runReportMailRetries(ctx.sequelize, relay(), { clinicId: clinic.id });
    expect(early.sent).toBe(0);
    expect(delivered(to)).toBe(0);

    const later = minutesFrom(mail.nextAttemptAt!, 1);
    const runs = await Promise.all([
      runReportMailRetries(ctx.sequelize, relay(), { now: later, clinicId: clinic.id }),
      runReportMailRetries(ctx.sequelize, relay(), { now: later, clinicId: clinic.id }),
    ]);
    expect(runs[0].sent + runs[1].sent).toBe(1);
    expect(delivered(to)).toBe(1);
    expect(await mailState(mail.id)).toMatchObject({ state: 'sent', attempts: 2, nextAttemptAt: null });
    const audit = (
      await auditEventsWhere({ clinicId: clinic.id, action: 'review.report.mail.sent', userId: null })
    ).at(-1);
    expect(audit?.details).toMatchObject({ mailId: mail.id, automatic: true });

    const again = await runReportMailRetries(ctx.sequelize, relay(), {
      now: minutesFrom(mail.nextAttemptAt!, 500),
      clinicId: clinic.id,
    });
    expect(again.sent).toBe(0);
    expect(delivered(to)).toBe(1);
  });

  test('when the relay refuses the address for good, then the server does not try again by itself and waits for a person', async () => {
    const to = `refused.${salt}@example.test`;
    fake.refuseNext(1);
    const mail = await send(to);
    expect(mail).toMatchObject({ state: 'failed', nextAttemptAt: null });
    expect(mail.lastError).toMatch(/550/);
    const run = await runReportMailRetries(ctx.sequelize, relay(), {
      now: new Date(Date.now() + 86_400_000),
      clinicId: clinic.id,
    });
    expect(run.sent).toBe(0);
    expect(delivered(to)).toBe(0);
    expect(await mailState(mail.id)).toMatchObject({ state: 'failed', attempts: 1 });
  });

  test('when the sender stopped while holding a report, then a later run takes it again and delivers it', async () => {
    const to = `stalled.${salt}@example.test`;
    fake.deferNext(1);
    const mail = await send(to);
    // What a process that died between claiming and sending leaves behind.
    await ctx.sequelize.query(
      `UPDATE report_mails SET state = 'sending', next_attempt_at = NULL, updated_at = now() - make_interval(secs => :secs) WHERE id = :id`,
      { replacements: { id: mail.id, secs: SENDING_STALE_MS / 1000 + 60 } },
    );
    const run = await runReportMailRetries(ctx.sequelize, relay(), { clinicId: clinic.id });
    expect(run.sent).toBe(1);
    expect(delivered(to)).toBe(1);
    expect(await mailState(mail.id)).toMatchObject({ state: 'sent' });
  });
});
