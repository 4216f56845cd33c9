import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { clientListResponseSchema, sessionListResponseSchema, type Role } from '@/shared/protocol';
import { insertClient, listClients } from '@/sync-server/src/repositories/clients-repository';
import { execute, selectRows } from '@/sync-server/src/repositories/sql';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let here: TestClinic;
let there: TestClinic;
let hereTokens: Record<Role, string>;
let thereTokens: Record<Role, string>;
const ids = { ada: randomUUID(), bo: randomUUID(), percent: randomUUID(), theirs: randomUUID() };
const sessionIds = { older: randomUUID(), newer: randomUUID(), theirs: randomUUID() };

beforeAll(async () => {
  here = await makeClinic('Here');
  there = await makeClinic('There');
  hereTokens = await tokensFor(ctx.app, here);
  thereTokens = await tokensFor(ctx.app, there);
  const client = { dateOfBirth: null, email: null, phone: null, notes: null };
  for (const row of [
    {
      ...client,
      id: ids.ada,
      clinicId: here.id,
      firstName: 'Ada',
      lastName: 'Quillfeather',
      email: 'ada@example.test',
    },
    { ...client, id: ids.bo, clinicId: here.id, firstName: 'Bo', lastName: 'Marchetti' },
    { ...client, id: ids.percent, clinicId: here.id, firstName: '100%', lastName: 'Literal' },
    { ...client, id: ids.theirs, clinicId: there.id, firstName: 'Ada', lastName: 'Elsewhere' },
  ])
    await insertClient(ctx.sequelize, row);
  // Every clinic starts with the built-in wording as its version 1.
  const [text] = await selectRows<{ id: string }>(
    ctx.sequelize,
    `SELECT id FROM consent_texts WHERE clinic_id = :clinicId AND version = 1`,
    { clinicId: here.id },
  );
  await execute(
    ctx.sequelize,
    `INSERT INTO consents (id, clinic_id, client_id, consent_text_id, consent_text_version, typed_name, consent_date)
     VALUES (:id, :clinicId, :clientId, :textId, 1, 'Ada Quillfeather', '2026-11-02')`,
    { id: randomUUID(), clinicId: here.id, clientId: ids.ada, textId: text!.id },
  );
  for (const session of [
    {
      id: sessionIds.older,
      clinicId: here.id,
      clientId: ids.ada,
      operatorId: here.users.operator.id,
      startedAt: new Date('2026-10-01T09:00:00Z'),
    },
    {
      id: sessionIds.newer,
      clinicId: here.id,
      clientId: ids.bo,
      operatorId: null,
      startedAt: new Date('2026-11-01T09:00:00Z'),
    },
    {
      id: sessionIds.theirs,
      clinicId: there.id,
      clientId: ids.theirs,
      operatorId: null,
      startedAt: new Date('2026-11-05T09:00:00Z'),
    },
  ])
    await addCompletedSession(session);
  for (const site of [
    { site: 'aortic', qualityVerdict: 'usable', skippedReason: null },
    { site: 'mitral', qualityVerdict: 'good', skippedReason: null },
    { site: 'pulmonic', qualityVerdict: null, skippedReason: 'client declined' },
  ])
    await execute(
      ctx.sequelize,
      `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, skipped_reason)
       VALUES (:id, :clinicId, :sessionId, :site, :qualityVerdict, :skippedReason)`,
      { ...site, id: randomUUID(), clinicId: here.id, sessionId: sessionIds.older },
    );
});
afterAll(() => ctx.close());

const addCompletedSession = (session: {
  id: string;
  clinicId: string;
  clientId: string;
  operatorId: string | null;
  startedAt: Date;
}) =>
  execute(
    ctx.sequelize,
    `INSERT INTO recording_sessions (id, clinic_id, client_id, operator_id, status, started_at)
     VALUES (:id, :clinicId, :clientId, :operatorId, 'completed', :startedAt)`,
    session,
  );

const get = (path: string, token: string) =>
  request(ctx.app).get(path).set('authorization', `Bearer ${token}`);

describe('clients', () => {
  test('when an operator lists clients, then only this clinic’s clients come back, with consent on file marked', async () => {
    const res = await get('/api/clients', hereTokens.operator);
    expect(res.status).toBe(200);
    const { clients } = clientListResponseSchema.parse(res.body);
    expect(clients.map((c) => c.id).sort()).toEqual([ids.ada, ids.bo, ids.percent].sort());
    expect(clients.find((c) => c.id === ids.ada)?.hasConsent).toBe(true);
    expect(clients.find((c) => c.id === ids.bo)?.hasConsent).toBe(false);
    // What the phone keeps so it does not ask again: who signed, when, which text.
    expect(clients.find((c) => c.id === ids.ada)?.consent).toMatchObject({
      signedName: 'Ada Quillfeather',
      signedOn: '2026-11-02',
      textVersion: 1,
    });
    expect(clients.find((c) => c.id === ids.bo)?.consent).toBeNull();
  });

  test('when another clinic’s user lists clients, then none of this clinic’s rows appear', async () => {
    const { clients } = clientListResponseSchema.parse((await get('/api/clients', thereTokens.admin)).body);
    expect(clients.map((c) => c.id)).toEqual([ids.theirs]);
  });

  test('when searching with ?q=, then first name, last name, full name and e-mail match, case-insensitively', async () => {
    const names = async (q: string) =>
      clientListResponseSchema
        .parse((await get(`/api/clients?q=${encodeURIComponent(q)}`, hereTokens.practitioner)).body)
        .clients.map((c) => c.id);
    expect(await names('quill')).toEqual([ids.ada]);
    expect(await names('ADA Q')).toEqual([ids.ada]);
    expect(await names('example.test')).toEqual([ids.ada]);
    expect(await names('marchetti')).toEqual([ids.bo]);
    expect(await names('nobody-by-this-name')).toEqual([]);
  });

  test('when the search holds % or _, then they match literally, not as wildcards', async () => {
    const res = await get(`/api/clients?q=${encodeURIComponent('%')}`, hereTokens.operator);
    expect(clientListResponseSchema.parse(res.body).clients.map((c) => c.id)).toEqual([ids.percent]);
  });

  test('when the search is over 100 characters, then it is 400', async () => {
    const res = await get(`/api/clients?q=${'a'.repeat(101)}`, hereTokens.operator);
    expect(res.status).toBe(400);
  });

  test('when the repository is asked with another clinic’s id, then it never returns this clinic’s rows', async () => {
    const rows = await listClients(ctx.sequelize, there.id, 'Ada');
    expect(rows.map((r) => r.id)).toEqual([ids.theirs]);
  });
});

describe('sessions', () => {
  test('when a practitioner lists sessions, then this clinic’s come newest first with client name and site verdicts', async () => {
    const res = await get('/api/sessions', hereTokens.practitioner);
    expect(res.status).toBe(200);
    const { sessions } = sessionListResponseSchema.parse(res.body);
    expect(sessions.map((s) => s.id)).toEqual([sessionIds.newer, sessionIds.older]);
    const older = sessions[1];
    expect(older.clientName).toBe('Ada Quillfeather');
    expect(older.operatorName).toBe(here.users.operator.name);
    expect(older.sites).toEqual([
      { site: 'mitral', verdict: 'good', skipped: false },
      { site: 'aortic', verdict: 'usable', skipped: false },
      { site: 'pulmonic', verdict: null, skipped: true },
    ]);
  });

  test('when another clinic’s admin lists sessions, then only their own session appears', async () => {
    const { sessions } = sessionListResponseSchema.parse(
      (await get('/api/sessions', thereTokens.admin)).body,
    );
    expect(sessions.map((s) => s.id)).toEqual([sessionIds.theirs]);
  });

  test('when a session is tombstoned, then it leaves the list', async () => {
    const gone = randomUUID();
    await addCompletedSession({
      id: gone,
      clinicId: here.id,
      clientId: ids.bo,
      operatorId: null,
      startedAt: new Date('2026-11-20T09:00:00Z'),
    });
    await execute(ctx.sequelize, `UPDATE recording_sessions SET deleted_at = now() WHERE id = :gone`, {
      gone,
    });
    const { sessions } = sessionListResponseSchema.parse((await get('/api/sessions', hereTokens.admin)).body);
    expect(sessions.map((s) => s.id)).not.toContain(gone);
  });
});
