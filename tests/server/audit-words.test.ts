import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type { AuditEventRow } from '@/shared/protocol/practice';
import { insertClient, insertSession } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
let other: TestClinic;
let tokens: Record<'operator' | 'practitioner' | 'admin', string>;
let otherTokens: Record<'operator' | 'practitioner' | 'admin', string>;

beforeAll(async () => {
  clinic = await makeClinic('Audit words');
  other = await makeClinic('Audit words other');
  tokens = await tokensFor(ctx.app, clinic);
  otherTokens = await tokensFor(ctx.app, other);
});
afterAll(() => ctx.close());

const as = (t: string) => ({ authorization: `Bearer ${t}` });
const q = (sql: string, replacements: Record<string, unknown>) => ctx.sequelize.query(sql, { replacements });

async function auditOf(query: string, token = tokens.admin): Promise<AuditEventRow[]> {
  const res = await request(ctx.app).get(`/api/audit?${query}`).set(as(token));
  expect(res.status).toBe(200);
  return res.body.events as AuditEventRow[];
}

describe('audit log names people and clients', () => {
  test('when a practitioner opens a visit, then the event names the practitioner and the client of the visit', async () => {
    const tag = randomUUID().slice(0, 6);
    const clientId = await insertClient(ctx.sequelize, clinic.id, { first: `Wren${tag}`, last: 'Halloway' });
    const sessionId = await insertSession(ctx.sequelize, clinic.id, clientId);
    expect(
      (await request(ctx.app).get(`/api/review/sessions/${sessionId}`).set(as(tokens.practitioner))).status,
    ).toBe(200);

    const [event] = await auditOf(`action=review.session.read&entityId=${sessionId}`);
    expect(event).toEqual(
      expect.objectContaining({
        userName: clinic.users.practitioner.name,
        clientId,
        clientName: `Wren${tag} Halloway`,
        clientErased: false,
      }),
    );
  });

  test('when the log is filtered by part of a client name, in either order, then only that client’s events are listed', async () => {
    const tag = randomUUID().slice(0, 6);
    const wanted = await insertClient(ctx.sequelize, clinic.id, { first: `Mira${tag}`, last: 'Quell' });
    const unwanted = await insertClient(ctx.sequelize, clinic.id, { first: `Oren${tag}`, last: 'Quell' });
    for (const id of [wanted, unwanted])
      expect((await request(ctx.app).get(`/api/client-records/${id}`).set(as(tokens.admin))).status).toBe(
        200,
      );

    for (const name of [`mira${tag}`, `Quell Mira${tag}`, `  mira${tag}   quell `]) {
      const events = await auditOf(`client=${encodeURIComponent(name)}`);
      expect(events.length).toBeGreaterThan(0);
      expect(events.every((e) => e.clientId === wanted)).toBe(true);
    }
    // LIKE wildcards typed by a person are plain characters (OWASP ASVS 5.3.4: parameterised, escaped queries).
    expect(await auditOf(`client=${encodeURIComponent('%')}`)).toEqual([]);
  });

  test('when another clinic has a client of the same name, then neither clinic sees the other’s events (ASVS 4.2.1)', async () => {
    const tag = randomUUID().slice(0, 6);
    const ours = await insertClient(ctx.sequelize, clinic.id, { first: `Sol${tag}`, last: 'Brae' });
    const theirs = await insertClient(ctx.sequelize, other.id, { first: `Sol${tag}`, last: 'Brae' });
    await request(ctx.app).get(`/api/client-records/${ours}`).set(as(tokens.admin));
    await request(ctx.app).get(`/api/client-records/${theirs}`).set(as(otherTokens.admin));

    expect((await auditOf(`client=Sol${tag}`)).map((e) => e.clientId)).toEqual([ours]);
    expect((await auditOf(`client=Sol${tag}`, otherTokens.admin)).map((e) => e.clientId)).toEqual([theirs]);
  });

  test('when a sign-in fails, then the event names the account and keeps no password', async () => {
    const wrong = `not-the-password-${randomUUID()}`;
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: clinic.users.operator.email, password: wrong });
    expect(res.status).toBe(401);

    const [event] = await auditOf(`action=auth.sign_in_failed&userId=${clinic.users.operator.id}`);
    expect(event).toEqual(
      expect.objectContaining({ subjectName: clinic.users.operator.name, clientId: null, clientName: null }),
    );
    expect(JSON.stringify(event)).not.toContain(wrong);
  });

  test('when a client is erased, then their earlier events keep the fact but no longer carry the name', async () => {
    const tag = randomUUID().slice(0, 6);
    const clientId = await insertClient(ctx.sequelize, clinic.id, { first: `Ash${tag}`, last: 'Morrow' });
    await request(ctx.app).get(`/api/client-records/${clientId}`).set(as(tokens.admin));
    const erase = await request(ctx.app)
      .post(`/api/client-records/${clientId}/erase`)
      .set(as(tokens.admin))
      .send({ confirmName: `Ash${tag} Morrow` });
    expect(erase.status).toBe(200);

    const events = await auditOf(`entityId=${clientId}`);
    expect(events.map((e) => e.action).sort()).toEqual(['client.erase', 'client.read']);
    for (const e of events)
      expect(e).toEqual(expect.objectContaining({ clientName: null, clientErased: true }));
    expect(JSON.stringify(events)).not.toContain(`Ash${tag}`);
  });
});

describe('erasure counts what a practice counts', () => {
  test('when a client with visits, recordings, a consent and a report e-mail is erased, then the answer counts each', async () => {
    const tag = randomUUID().slice(0, 6);
    const clientId = await insertClient(ctx.sequelize, clinic.id, { first: `Tam${tag}`, last: 'Vey' });
    const sessions = [
      await insertSession(ctx.sequelize, clinic.id, clientId, { status: 'reviewed' }),
      await insertSession(ctx.sequelize, clinic.id, clientId, { status: 'completed' }),
    ];
    // Three sites with sound and one skipped (no clip): the skipped one is not a recording.
    const sites: [string, string, string | null][] = [
      [sessions[0], 'aortic', 'a'.repeat(64)],
      [sessions[0], 'mitral', 'b'.repeat(64)],
      [sessions[1], 'aortic', 'c'.repeat(64)],
      [sessions[1], 'mitral', null],
    ];
    for (const [sessionId, site, sha] of sites)
      await q(
        `INSERT INTO site_recordings (id, clinic_id, session_id, site, clip_sha256, clip_state, recorded_at)
         VALUES (:id, :clinicId, :sessionId, :site, :sha, :state, now())`,
        {
          id: randomUUID(),
          clinicId: clinic.id,
          sessionId,
          site,
          sha,
          state: sha ? 'stored' : 'none',
        },
      );
    const consentText = randomUUID();
    await q(
      `INSERT INTO consent_texts (id, clinic_id, version, title, body, created_at, updated_at)
       VALUES (:id, :clinicId, (SELECT coalesce(max(version), 0) + 1 FROM consent_texts WHERE clinic_id = :clinicId),
               'Consent', 'Recording heart sounds.', now(), now())`,
      { id: consentText, clinicId: clinic.id },
    );
    await q(
      `INSERT INTO consents (id, clinic_id, client_id, consent_text_id, consent_text_version, typed_name, consent_date, recorded_by)
       VALUES (:id, :clinicId, :clientId, :consentText, 1, 'Tam Vey', '2026-11-30', :operator)`,
      { id: randomUUID(), clinicId: clinic.id, clientId, consentText, operator: clinic.users.operator.id },
    );
    await q(
      `INSERT INTO report_mails (id, clinic_id, session_id, to_address, subject, body_text, attachment_name, attachment, state)
       VALUES (:id, :clinicId, :sessionId, 'tam@client.fourpoint.test', 'Report', 'Body', 'r.pdf', ''::bytea, 'sent')`,
      { id: randomUUID(), clinicId: clinic.id, sessionId: sessions[0] },
    );

    const res = await request(ctx.app)
      .post(`/api/client-records/${clientId}/erase`)
      .set(as(tokens.admin))
      .send({ confirmName: `tam${tag} vey` });
    expect(res.status).toBe(200);
    expect(res.body.clientName).toBe(`Tam${tag} Vey`);
    expect(res.body.erased).toEqual({ visits: 2, recordings: 3, consents: 1, reportEmails: 1 });
    // The report e-mail held the client's address and the report: it is gone now, not at the purge.
    const [mails] = await ctx.sequelize.query(`SELECT 1 FROM report_mails WHERE session_id = :id`, {
      replacements: { id: sessions[0] },
    });
    expect(mails).toHaveLength(0);

    const [event] = await auditOf(`action=client.erase&entityId=${clientId}`);
    expect(event.details).toEqual(
      expect.objectContaining({ visits: 2, recordings: 3, consents: 1, reportEmails: 1 }),
    );
  });
});
