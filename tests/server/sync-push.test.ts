// What this proves: a push is applied exactly once per mutation id, whatever the delivery order or count, and
// answers say so; the device's own follow-up edits never come back to it as conflicts; outdated apps get 426.
import { randomUUID } from 'node:crypto';
import axios from 'axios';
import {
  OUTDATED_CLIENT_MESSAGE,
  SYNC_PROTOCOL_VERSION,
  type Mutation,
  type PushResponse,
} from '@/shared/protocol/sync';
import { QueryTypes } from 'sequelize';
import { createHttpTransport } from '@/shared/sync';
import {
  SITES,
  SimDevice,
  clientFields,
  clinicWithTokens,
  sessionFields,
  siteFields,
  mutation,
  syncServerPerFile,
} from './sync-helpers/devices';

const sync = syncServerPerFile();
const push = sync.push;

function sessionBatch(): Mutation[] {
  const clientId = randomUUID();
  const sessionId = randomUUID();
  return [
    mutation('clients', clientId, clientFields(randomUUID().slice(0, 6))),
    mutation('recording_sessions', sessionId, sessionFields(clientId)),
    ...SITES.map((site) => mutation('site_recordings', randomUUID(), siteFields(sessionId, site))),
  ];
}

async function rowsOf(clinicId: string) {
  return sync.server.ctx.sequelize.query<{ id: string; version: number; change_seq: string }>(
    `SELECT id, version, change_seq FROM clients WHERE clinic_id = $1
     UNION ALL SELECT id, version, change_seq FROM recording_sessions WHERE clinic_id = $1
     UNION ALL SELECT id, version, change_seq FROM site_recordings WHERE clinic_id = $1 ORDER BY id`,
    { bind: [clinicId], type: QueryTypes.SELECT },
  );
}

test('when the same push is replayed 5 times and then out of order, then rows and results are identical and nothing is applied twice', async () => {
  const { clinic, operator } = await clinicWithTokens(sync.server, 'Replay');
  const batch = sessionBatch();
  const first = await push(operator, batch);
  expect(first.results.map((r) => r.status)).toEqual(Array(6).fill('applied'));
  const after = await rowsOf(clinic.id);
  expect(after).toHaveLength(6);

  const replays: PushResponse[] = [];
  for (let i = 0; i < 5; i++) replays.push(await push(operator, batch));
  replays.push(await push(operator, [...batch].reverse()));
  for (const replay of replays) {
    const byId = new Map(replay.results.map((r) => [r.mutationId, r]));
    for (const m of batch)
      expect(byId.get(m.mutationId)).toEqual({
        mutationId: m.mutationId,
        status: 'already_applied',
        original: 'applied',
        newVersion: 1,
      });
  }
  // Same rows, same versions, and not even the change number moved.
  expect(await rowsOf(clinic.id)).toEqual(after);
  const [{ count }] = await sync.server.ctx.sequelize.query<{ count: string }>(
    `SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`,
    {
      bind: [clinic.id],
      type: QueryTypes.SELECT,
    },
  );
  expect(Number(count)).toBe(6);
});

test('when a batch arrives children first, then the children are refused as missing their parent and the rest still applies', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Order');
  const batch = sessionBatch();
  const reversed = await push(operator, [...batch].reverse());
  // Reversed: four sites, then the session (before its client), then the client.
  expect(reversed.results.map((r) => r.status)).toEqual([...Array(5).fill('rejected'), 'applied']);
  for (const r of reversed.results.slice(0, 5)) expect(r).toMatchObject({ code: 'missing_parent' });
  const again = await push(operator, batch);
  expect(again.results.map((r) => r.status)).toEqual(['already_applied', ...Array(5).fill('applied')]);
});

test('when one mutation in a batch is invalid, then it alone is rejected with its reason', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Bad');
  const batch = sessionBatch();
  batch[2] = { ...batch[2], change: { ...batch[2].change, site: 'elbow' } };
  batch.push({
    mutationId: randomUUID(),
    entity: 'site_recordings',
    id: randomUUID(),
    baseVersion: 0,
    change: { analysis: {} },
  });
  const res = await push(operator, batch);
  expect(res.results.map((r) => r.status)).toEqual([
    'applied',
    'applied',
    'rejected',
    'applied',
    'applied',
    'applied',
    'rejected',
  ]);
  expect(res.results[2]).toMatchObject({ code: 'invalid_change', reason: expect.stringContaining('site') });
  expect(res.results[6]).toMatchObject({ reason: 'analysis is set by the server, not by a device.' });
});

test('when a device edits its own row twice offline, then both edits apply in order and neither is a conflict', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Own');
  const device = new SimDevice(sync.server.url, operator);
  const id = await device.create('clients', clientFields('own'));
  await device.sync();
  await device.edit('clients', id, { lastName: 'first' });
  await device.edit('clients', id, { lastName: 'second', phone: '555-0100' });
  const report = await device.sync();
  expect(report).toMatchObject({ sent: 2, conflicts: 0, failed: 0 });
  expect(device.storage.confirmedRow('clients', id)).toMatchObject({
    version: 3,
    data: { lastName: 'second', phone: '555-0100' },
  });
});

test('when a device speaks an older protocol, then it gets 426 with the message the app shows', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Old');
  const res = await axios.post(
    `${sync.server.url}/api/sync/push`,
    { protocolVersion: SYNC_PROTOCOL_VERSION - 1, deviceId: randomUUID(), mutations: sessionBatch() },
    { headers: { authorization: `Bearer ${operator}` }, validateStatus: () => true },
  );
  expect(res.status).toBe(426);
  expect(res.data.error).toMatchObject({ code: 'outdated_client', message: OUTDATED_CLIENT_MESSAGE });
});

test('when an outdated device syncs, then the engine keeps its outbox and reports the message', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'OldEngine');
  // The engine always states its own version, so an app left behind is simulated by rewriting the header.
  const oldHttp = axios.create();
  oldHttp.interceptors.request.use((config) => {
    config.headers.set('x-fourpoint-protocol', '0');
    return config;
  });
  const old = new SimDevice(sync.server.url, operator, {
    transport: createHttpTransport({
      baseUrl: sync.server.url,
      getAccessToken: () => operator,
      axiosInstance: oldHttp,
    }),
  });
  await old.create('clients', clientFields('old'));
  const report = await old.sync();
  expect(report.error).toBe(OUTDATED_CLIENT_MESSAGE);
  expect(old.engine.status.outdated).toBe(OUTDATED_CLIENT_MESSAGE);
  expect((await old.storage.listOutbox()).map((i) => [i.state, i.attempts])).toEqual([['waiting', 0]]);
});
