// What this proves: a push batch runs in one transaction, yet a mutation the database refuses fails alone (the
// ones before and after it still apply, and are recorded once); two deliveries of one batch at the same moment
// apply each mutation once; an edit pointing at a missing parent is refused without moving the version.
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import {
  clientFields,
  clinicWithTokens,
  sessionFields,
  siteFields,
  mutation,
  syncServerPerFile,
} from './sync-helpers/devices';

const sync = syncServerPerFile();
const push = sync.push;

async function count(sql: string, bind: unknown[]): Promise<number> {
  const [row] = await sync.server.ctx.sequelize.query<{ count: string }>(sql, {
    bind,
    type: QueryTypes.SELECT,
  });
  return Number(row.count);
}

test('when one mutation in the middle of a batch breaks a database rule, then it alone is refused and the rest apply once', async () => {
  const { clinic, operator } = await clinicWithTokens(sync.server, 'Middle');
  const clientId = randomUUID();
  const sessionId = randomUUID();
  const batch = [
    mutation('clients', clientId, clientFields('middle')),
    mutation('recording_sessions', sessionId, sessionFields(clientId)),
    mutation('site_recordings', randomUUID(), siteFields(sessionId, 'mitral')),
    // A second mitral recording in one session: only the database's unique rule catches it.
    mutation('site_recordings', randomUUID(), siteFields(sessionId, 'mitral')),
    mutation('site_recordings', randomUUID(), siteFields(sessionId, 'tricuspid')),
    mutation('clients', clientId, { phone: 'after the refused one' }, 1),
  ];
  const first = await push(operator, batch);
  expect(first.results.map((r) => r.status)).toEqual([
    'applied',
    'applied',
    'applied',
    'rejected',
    'applied',
    'applied',
  ]);
  expect(first.results[3]).toMatchObject({
    code: 'invalid_change',
    reason: 'This session already has a recording for that site; change the existing one instead.',
  });
  expect(first.results[5]).toMatchObject({ newVersion: 2 });
  expect(await count(`SELECT count(*) FROM site_recordings WHERE session_id = $1`, [sessionId])).toBe(2);
  expect(await count(`SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`, [clinic.id])).toBe(5);

  const replay = await push(operator, batch);
  expect(replay.results.map((r) => r.status)).toEqual([
    'already_applied',
    'already_applied',
    'already_applied',
    'rejected',
    'already_applied',
    'already_applied',
  ]);
  expect(await count(`SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`, [clinic.id])).toBe(5);
  const [client] = await sync.server.ctx.sequelize.query<{ version: number; phone: string }>(
    `SELECT version, phone FROM clients WHERE id = $1`,
    { bind: [clientId], type: QueryTypes.SELECT },
  );
  expect(client).toEqual({ version: 2, phone: 'after the refused one' });
});

test('when the same batch is delivered twice at the same moment, then each mutation is applied by exactly one delivery', async () => {
  const { clinic, operator } = await clinicWithTokens(sync.server, 'Twice');
  const deviceId = randomUUID();
  const clientId = randomUUID();
  const sessionId = randomUUID();
  const batch = [
    mutation('clients', clientId, clientFields('twice')),
    mutation('recording_sessions', sessionId, sessionFields(clientId)),
    mutation('site_recordings', randomUUID(), siteFields(sessionId, 'aortic')),
    mutation('site_recordings', randomUUID(), siteFields(sessionId, 'pulmonic')),
  ];
  const [a, b] = await Promise.all([push(operator, batch, deviceId), push(operator, batch, deviceId)]);
  batch.forEach((mutation, i) => {
    const statuses = [a.results[i].status, b.results[i].status].sort();
    expect({ mutation: mutation.entity, statuses }).toEqual({
      mutation: mutation.entity,
      statuses: ['already_applied', 'applied'],
    });
  });
  expect(await count(`SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`, [clinic.id])).toBe(4);
  expect(await count(`SELECT count(*) FROM site_recordings WHERE session_id = $1`, [sessionId])).toBe(2);
});

test('when an edit points a session at a client that is not on the server, then it is refused and the version stays', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Parent');
  const clientId = randomUUID();
  const sessionId = randomUUID();
  await push(operator, [
    mutation('clients', clientId, clientFields('parent')),
    mutation('recording_sessions', sessionId, sessionFields(clientId)),
  ]);
  const res = await push(operator, [
    mutation('recording_sessions', sessionId, { clientId: randomUUID() }, 1),
    mutation('recording_sessions', sessionId, { finishedAt: '2026-11-30T09:20:00.000Z' }, 1),
  ]);
  expect(res.results[0]).toMatchObject({ status: 'rejected', code: 'missing_parent' });
  expect(res.results[1]).toMatchObject({ status: 'applied', newVersion: 2 });
  const [session] = await sync.server.ctx.sequelize.query<{ version: number; client_id: string }>(
    `SELECT version, client_id FROM recording_sessions WHERE id = $1`,
    { bind: [sessionId], type: QueryTypes.SELECT },
  );
  expect(session).toEqual({ version: 2, client_id: clientId });
});
