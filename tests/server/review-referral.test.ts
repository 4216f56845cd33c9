import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import request from 'supertest';
import type { Role } from '@/shared/protocol';
import { reviewSessionDetailSchema, type ReviewSessionDetail } from '@/shared/protocol/review';
import { MURMUR_PAIR_THRESHOLD } from '@/shared/analysis/murmur';
import { analyseDemoClip } from '@/sync-server/seeders/analyse-demo-clip';
import { DEMO_USERS, seedDemo } from '@/sync-server/seeders/demo';
import { demoPassword } from '@/sync-server/src/config/secrets';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { replaceServices } from '@/sync-server/src/composition-root';
import { addClient, addSession } from './helpers/review-fixtures';
import {
  auditEventsWhere,
  makeClinic,
  makeTestContext,
  tokensFor,
  type TestClinic,
} from './helpers/test-app';

// The demo clinic has fixed ids by design, so this file shares it with other runs: it only reads there.
const ctx = makeTestContext();
const blobDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-referral-blobs-'));
const blobStore = new LocalDiskBlobStore(blobDir);
const auth = (token: string) => ({ authorization: `Bearer ${token}` });
let demoToken: string;
let clinic: TestClinic;
let tokens: Record<Role, string>;
jest.setTimeout(180_000);

beforeAll(async () => {
  replaceServices({ blobStore });
  await seedDemo({ sequelize: ctx.sequelize, blobStore, password: demoPassword(), analyse: analyseDemoClip });
  const practitioner = DEMO_USERS.find((u) => u.role === 'practitioner')!;
  const signedIn = await request(ctx.app)
    .post('/api/auth/sign-in')
    .send({ email: practitioner.email, password: demoPassword() });
  expect(signedIn.status).toBe(200);
  demoToken = signedIn.body.accessToken;
  clinic = await makeClinic('Referral');
  tokens = await tokensFor(ctx.app, clinic);
});
afterAll(() => ctx.close());

async function listIds(token: string, query: Record<string, string>): Promise<string[]> {
  const ids: string[] = [];
  let cursor: string | null = null;
  do {
    const res: request.Response = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ ...query, limit: '100', ...(cursor ? { cursor } : {}) })
      .set(auth(token));
    expect(res.status).toBe(200);
    ids.push(...res.body.sessions.map((s: { id: string }) => s.id));
    cursor = res.body.nextCursor;
  } while (cursor);
  return ids.sort();
}

async function detailOf(token: string, id: string): Promise<ReviewSessionDetail> {
  const res = await request(ctx.app).get(`/api/review/sessions/${id}`).set(auth(token));
  expect(res.status).toBe(200);
  return reviewSessionDetailSchema.parse(res.body);
}

async function mailPreview(token: string, id: string): Promise<string> {
  const res = await request(ctx.app).get(`/api/review/sessions/${id}/report-mail-preview`).set(auth(token));
  expect(res.status).toBe(200);
  return res.body.preview.bodyText as string;
}

// pdftotext (poppler-utils) reads the PDF as a client's viewer would, independent of the code that wrote it.
async function reportText(token: string, id: string): Promise<string> {
  const res = await request(ctx.app)
    .get(`/api/review/sessions/${id}/report`)
    .set(auth(token))
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
  expect(res.status).toBe(200);
  const file = path.join(blobDir, `${id}.pdf`);
  fs.writeFileSync(file, res.body as Buffer);
  return execFileSync('pdftotext', ['-layout', file, '-']).toString('utf8');
}

// The referral's own line (case-sensitive: the client caution mentions "please see a licensed clinician" in a sentence).
const MAIL_REFERRAL = /^Please see a licensed clinician\./m;
const REPORT_REFERRAL = /^\s*Please see a licensed clinician\s*$/m;
// A row that says "refer" outright, not a short-clip note ("if it persists, refer ...").
const refersOutright = (reading: string) =>
  /^(Above|Below) range: refer to a licensed clinician$/.test(reading);

// A 1×1 PNG made here (zlib-compressed rows, CRC per the PNG specification, RFC 2083), so the logo is ours.
function onePixelPng(): string {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    return c >>> 0;
  });
  const crc = (buf: Buffer) => {
    let c = 0xffffffff;
    for (const b of buf) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8);
    return (c ^ 0xffffffff) >>> 0;
  };
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const out = Buffer.alloc(8 + data.length + 4);
    out.writeUInt32BE(data.length, 0);
    body.copy(out, 4);
    out.writeUInt32BE(crc(body), 8 + data.length);
    return out;
  };
  const ihdr = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
  const idat = zlib.deflateSync(Buffer.from([0, 200, 80, 40]));
  const png = Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', idat),
    chunk('IEND', Buffer.alloc(0)),
  ]);
  return `data:image/png;base64,${png.toString('base64')}`;
}

describe("the client's report", () => {
  test('when the clinic has a logo and an address, then the report carries both, and none of the practitioner-only text', async () => {
    const settings = await request(ctx.app).get('/api/settings').set(auth(tokens.admin));
    expect(settings.status).toBe(200);
    const address = '12 Quayside Row\nPortmere PM1 4QX';
    const saved = await request(ctx.app)
      .put('/api/settings')
      .set(auth(tokens.admin))
      .send({ ...settings.body, address, logoDataUrl: onePixelPng() });
    expect(saved.status).toBe(200);
    const clientId = await addClient(clinic.id, 'Rhea', 'Readwell');
    const id = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-09T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 72 }, aortic: { heartRateBpm: 73 } },
    });
    const text = (await reportText(tokens.practitioner, id)).replace(/\s+/g, ' ');
    expect(text).toContain('12 Quayside Row, Portmere PM1 4QX');
    // Product brief, Cautions: the client's copy leaves out the sentence about the practitioner's licence.
    expect(text).not.toContain('scope of your licence');
    expect(text).not.toMatch(/from memory/i);
    expect(text).not.toMatch(/SDNN|RMSSD|pNN50/);
    expect(text).toContain('Heart rate');
    // pdfimages (poppler-utils) lists the images the PDF holds: the logo is the only one.
    const images = execFileSync('pdfimages', ['-list', path.join(blobDir, `${id}.pdf`)]).toString('utf8');
    expect(images.trim().split('\n').slice(2)).toHaveLength(1);
  });
});

describe('referral agreement', () => {
  test('when the demo clinic is reviewed, then the flagged filter, each session view, its report and its e-mail agree', async () => {
    const all = await listIds(demoToken, {});
    const flagged = await listIds(demoToken, { flagged: 'true' });
    const unflagged = await listIds(demoToken, { flagged: 'false' });
    // The demo must hold both kinds, or the agreement below would prove nothing.
    expect(flagged.length).toBeGreaterThan(0);
    expect(unflagged.length).toBeGreaterThan(0);
    expect([...flagged, ...unflagged].sort()).toEqual(all);

    for (const id of all) {
      const detail = await detailOf(demoToken, id);
      const isFlagged = flagged.includes(id);
      expect({ id, flagged: detail.flagged }).toEqual({ id, flagged: isFlagged });
      expect(detail.referral.flagged).toBe(isFlagged);
      expect(detail.referral.reasons.length > 0).toBe(isFlagged);
      // No row reads "refer to a licensed clinician" on a session that is not flagged.
      const refers = detail.sites.some(
        (s) => s.referral || s.measurements.some((m) => refersOutright(m.reading)),
      );
      expect(refers).toBe(isFlagged);
      expect(MAIL_REFERRAL.test(await mailPreview(demoToken, id))).toBe(isFlagged);
    }
    const text = await reportText(demoToken, flagged[0]!);
    expect(text).toMatch(REPORT_REFERRAL);
    expect(await reportText(demoToken, unflagged[0]!)).not.toMatch(REPORT_REFERRAL);
  });

  test('when a site screens as a possible murmur with every measure in range, then the session is flagged everywhere with the murmur as its reason', async () => {
    const clientId = await addClient(clinic.id, 'Odile', 'Murmurton');
    const screen = (murmur: 'possible' | 'unlikely' | 'unsure') => ({
      murmur,
      score: murmur === 'possible' ? 0.8 : 0.2,
      reasons: ['Sound energy fills most of systole'],
    });
    const possible = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-01T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 72, screen: screen('possible') }, aortic: { heartRateBpm: 72 } },
    });
    const unsure = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-02T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 72, screen: screen('unsure') } },
    });
    // An analysis from before the screen existed has no `screen` at all.
    const older = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-03T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 72 } },
    });
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'true' })).toEqual([possible]);
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'false' })).toEqual(
      [unsure, older].sort(),
    );
    const detail = await detailOf(tokens.practitioner, possible);
    expect(detail.referral.reasons).toEqual(['Mitral: Possible murmur']);
    expect(detail.sites[0]!.murmurScreen).toMatchObject({ murmur: 'possible' });
    expect((await detailOf(tokens.practitioner, older)).sites[0]!.murmurScreen).toBeNull();
    expect(await mailPreview(tokens.practitioner, possible)).toContain('Mitral site: Possible murmur');
    expect(await reportText(tokens.practitioner, possible)).toMatch(REPORT_REFERRAL);
  });

  // The visit rule of murmur screen 3 (shared/analysis/README.md): two borderline sites flag a visit that no site
  // flags alone. Scores are placed just above and below the committed model's pair threshold.
  test('when two sites of a visit are borderline for a murmur, then the visit is flagged everywhere at those sites; one borderline site flags nothing', async () => {
    const clientId = await addClient(clinic.id, 'Perrin', 'Borderwell');
    const borderline = {
      murmur: 'unlikely' as const,
      score: MURMUR_PAIR_THRESHOLD + 0.02,
      reasons: [
        'borderline: the visit is flagged as a possible murmur if another site of the same visit is borderline too',
      ],
    };
    const clear = {
      murmur: 'unlikely' as const,
      score: MURMUR_PAIR_THRESHOLD - 0.02,
      reasons: ['no more sound'],
    };
    const pair = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-05T09:00:00Z'),
      sites: {
        mitral: { heartRateBpm: 72, screen: borderline },
        tricuspid: { heartRateBpm: 72, screen: clear },
        aortic: { heartRateBpm: 72, screen: borderline },
      },
    });
    const single = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-06T09:00:00Z'),
      sites: {
        mitral: { heartRateBpm: 72, screen: borderline },
        aortic: { heartRateBpm: 72, screen: clear },
      },
    });
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'true' })).toEqual([pair]);
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'false' })).toEqual([single]);
    const rows = await request(ctx.app)
      .get('/api/review/sessions')
      .query({ clientId, limit: '10' })
      .set(auth(tokens.practitioner));
    const flaggedById = Object.fromEntries(
      (rows.body.sessions as { id: string; flagged: boolean }[]).map((r) => [r.id, r.flagged]),
    );
    expect(flaggedById).toEqual({ [pair]: true, [single]: false });

    const detail = await detailOf(tokens.practitioner, pair);
    expect(detail.referral.reasons).toEqual(['Mitral: Possible murmur', 'Aortic: Possible murmur']);
    const mitral = detail.sites.find((s) => s.site === 'mitral')!;
    expect(mitral.murmurScreen).toMatchObject({ murmur: 'possible' });
    expect(mitral.murmurScreen!.reasons[0]).toMatch(/another site of this visit/);
    expect(detail.sites.find((s) => s.site === 'tricuspid')!.murmurScreen).toMatchObject({
      murmur: 'unlikely',
    });
    expect(await mailPreview(tokens.practitioner, pair)).toContain('Aortic site: Possible murmur');
    expect(await reportText(tokens.practitioner, pair)).toMatch(REPORT_REFERRAL);
    expect((await detailOf(tokens.practitioner, single)).referral.flagged).toBe(false);
  });

  test('when the practitioner flags a session with a note and later clears it, then the list, the view and the e-mail follow, and both are audited', async () => {
    const clientId = await addClient(clinic.id, 'Pell', 'Handflag');
    const id = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-05T09:00:00Z'),
      sites: { mitral: { heartRateBpm: 70 } },
    });
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'true' })).toEqual([]);
    const note = 'Short of breath on the stairs; wants a second opinion';
    const set = await request(ctx.app)
      .put(`/api/review/sessions/${id}/referral-flag`)
      .set(auth(tokens.practitioner))
      .send({ flagged: true, note });
    expect(set.status).toBe(200);
    expect(set.body.referral).toMatchObject({ flagged: true, manual: { note } });
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'true' })).toEqual([id]);
    expect((await detailOf(tokens.practitioner, id)).referral.reasons).toEqual([
      `Flagged by ${clinic.users.practitioner.name}: ${note}`,
    ]);
    expect(await mailPreview(tokens.practitioner, id)).toContain(`Your practitioner's note: ${note}`);

    const cleared = await request(ctx.app)
      .put(`/api/review/sessions/${id}/referral-flag`)
      .set(auth(tokens.practitioner))
      .send({ flagged: false, note: 'Seen by the GP, all clear' });
    expect(cleared.status).toBe(200);
    expect(cleared.body.referral).toEqual({ flagged: false, reasons: [], manual: null });
    expect(await listIds(tokens.practitioner, { clientId, flagged: 'false' })).toEqual([id]);
    const events = await auditEventsWhere({ clinicId: clinic.id, entityId: id });
    expect(events.map((e) => e.action).filter((a) => a.startsWith('review.referral'))).toEqual([
      'review.referral.flag',
      'review.referral.clear',
    ]);
  });

  test('when a flag comes without a note, then it is refused with a message saying what to write, and nothing changes', async () => {
    const clientId = await addClient(clinic.id, 'Nola', 'Nonote');
    const id = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-06T09:00:00Z'),
    });
    const res = await request(ctx.app)
      .put(`/api/review/sessions/${id}/referral-flag`)
      .set(auth(tokens.practitioner))
      .send({ flagged: true, note: '   ' });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toContain('Write a short note saying why.');
    expect((await detailOf(tokens.practitioner, id)).flagged).toBe(false);
  });

  test('when an operator tries to flag, then it is refused', async () => {
    const clientId = await addClient(clinic.id, 'Opal', 'Noflag');
    const id = await addSession({
      clinicId: clinic.id,
      clientId,
      startedAt: new Date('2026-10-07T09:00:00Z'),
    });
    const res = await request(ctx.app)
      .put(`/api/review/sessions/${id}/referral-flag`)
      .set(auth(tokens.operator))
      .send({ flagged: true, note: 'no' });
    expect(res.status).toBe(403);
  });
});
