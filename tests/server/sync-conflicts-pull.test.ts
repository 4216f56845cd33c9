// What this proves: concurrent offline edits of one row become one conflict with both versions kept, an admin's
// resolution is a new version every device converges on (and is audited); a paged pull during concurrent writes
// delivers every changed row exactly once; a tombstone survives to a fresh device.
import { randomUUID } from 'node:crypto';
import axios from 'axios';
import { QueryTypes } from 'sequelize';
import { SYNC_PROTOCOL_VERSION, type PullResponse } from '@/shared/protocol/sync';
import { SimDevice, clientFields, clinicWithTokens, syncServerPerFile } from './sync-helpers/devices';

const sync = syncServerPerFile();

const api = (token: string) =>
  axios.create({
    baseURL: sync.server.url,
    headers: { authorization: `Bearer ${token}` },
    validateStatus: () => true,
  });

test('when two devices edit the same row offline, then one conflict keeps both versions, the admin resolves field by field, and both devices converge', async () => {
  const { clinic, operator, admin } = await clinicWithTokens(sync.server, 'Conflict');
  const a = new SimDevice(sync.server.url, operator);
  const b = new SimDevice(sync.server.url, operator);
  const id = await a.create('clients', clientFields('conf'));
  await a.sync();
  await b.sync();
  expect(b.storage.confirmedRow('clients', id)?.version).toBe(1);

  await a.edit('clients', id, { phone: '555-0101', lastName: 'from A' });
  await b.edit('clients', id, { lastName: 'from B', email: 'b@example.test' });
  expect(await a.sync()).toMatchObject({ sent: 1, conflicts: 0 });
  expect(await b.sync()).toMatchObject({ sent: 0, conflicts: 1 });

  const list = await api(admin).get('/api/admin/conflicts');
  expect(list.status).toBe(200);
  expect(list.data.conflicts).toHaveLength(1);
  const summary = list.data.conflicts[0];
  expect(summary).toMatchObject({
    entity: 'clients',
    rowId: id,
    status: 'open',
    deviceId: b.deviceId,
    serverDeviceId: a.deviceId,
  });
  expect(summary.differingFields.sort()).toEqual(['email', 'lastName']);

  const detail = (await api(admin).get(`/api/admin/conflicts/${summary.id}`)).data.conflict;
  expect(detail.server.data).toMatchObject({ lastName: 'from A', phone: '555-0101', email: null });
  expect(detail.client.data).toMatchObject({
    lastName: 'from B',
    phone: '555-0101',
    email: 'b@example.test',
  });

  const missingPick = await api(admin).post(`/api/admin/conflicts/${summary.id}/resolve`, {
    keep: 'fields',
    fields: { lastName: 'client' },
    note: 'x',
  });
  expect(missingPick.status).toBe(400);
  expect(missingPick.data.error.message).toContain('Missing: email');
  const byOperator = await api(operator).post(`/api/admin/conflicts/${summary.id}/resolve`, {
    keep: 'client',
    note: 'x',
  });
  expect(byOperator.status).toBe(403);

  const resolved = await api(admin).post(`/api/admin/conflicts/${summary.id}/resolve`, {
    keep: 'fields',
    fields: { lastName: 'server', email: 'client' },
    note: 'Kept the room note, took the new e-mail.',
  });
  expect(resolved.status).toBe(200);
  expect(resolved.data.newVersion).toBe(3);
  const again = await api(admin).post(`/api/admin/conflicts/${summary.id}/resolve`, {
    keep: 'client',
    note: 'again',
  });
  expect(again.status).toBe(409);

  await a.sync();
  await b.sync();
  const expected = {
    version: 3,
    data: expect.objectContaining({ lastName: 'from A', phone: '555-0101', email: 'b@example.test' }),
  };
  expect(a.storage.confirmedRow('clients', id)).toMatchObject(expected);
  expect(b.storage.confirmedRow('clients', id)).toMatchObject(expected);
  expect(await b.storage.localRow('clients', id)).toEqual(b.storage.confirmedRow('clients', id));

  const [audit] = await sync.server.ctx.sequelize.query<{ user_id: string; details: { note: string } }>(
    `SELECT user_id, details FROM audit_events WHERE clinic_id = $1 AND action = 'sync.conflict.resolved'`,
    { bind: [clinic.id], type: QueryTypes.SELECT },
  );
  expect(audit).toMatchObject({
    user_id: clinic.users.admin.id,
    details: { note: 'Kept the room note, took the new e-mail.' },
  });
});

test('when a row is deleted and synced, then a fresh device pulls it as a tombstone and an old edit cannot revive it', async () => {
  const { operator, admin } = await clinicWithTokens(sync.server, 'Tomb');
  // Deleting a synced row is the admin's (shared/protocol/field-access.ts).
  const a = new SimDevice(sync.server.url, admin);
  const stale = new SimDevice(sync.server.url, operator);
  const id = await a.create('clients', clientFields('tomb'));
  await a.sync();
  await stale.sync();
  await a.remove('clients', id);
  expect(await a.sync()).toMatchObject({ sent: 1 });

  const fresh = new SimDevice(sync.server.url, operator);
  await fresh.sync();
  expect(fresh.storage.confirmedRow('clients', id)).toMatchObject({
    version: 2,
    deletedAt: expect.any(String),
  });

  await stale.edit('clients', id, { lastName: 'edited on a device that missed the delete' });
  expect(await stale.sync()).toMatchObject({ conflicts: 1 });
  const again = new SimDevice(sync.server.url, operator);
  await again.sync();
  expect(again.storage.confirmedRow('clients', id)).toMatchObject({
    deletedAt: expect.any(String),
    data: expect.objectContaining({ lastName: 'Testwood' }),
  });
});

test('when a device pages through pulls while other devices write, then every changed row arrives exactly once', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'Paged');
  const writers = Array.from({ length: 4 }, () => new SimDevice(sync.server.url, operator));
  const seed: string[] = [];
  for (let i = 0; i < 30; i++) seed.push(await writers[i % 4].create('clients', clientFields(`seed${i}`)));
  await Promise.all(writers.map((w) => w.sync()));

  const seen = new Map<string, number>();
  let checkpoint = '0';
  const pullPage = async () => {
    const res = await api(operator).post('/api/sync/pull', {
      protocolVersion: SYNC_PROTOCOL_VERSION,
      deviceId: randomUUID(),
      checkpoint,
      limit: 7,
    });
    const page = res.data as PullResponse;
    for (const row of page.rows) seen.set(row.id, (seen.get(row.id) ?? 0) + 1);
    checkpoint = page.nextCheckpoint;
    return page;
  };

  const written: string[] = [];
  const writing = (async () => {
    for (let round = 0; round < 10; round++) {
      await Promise.all(
        writers.map(async (w, i) => {
          written.push(await w.create('clients', clientFields(`live${round}-${i}`)));
          await w.sync();
        }),
      );
    }
  })();
  let done = false;
  void writing.then(() => (done = true));
  while (!done) await pullPage();
  await writing;
  while ((await pullPage()).hasMore);

  const all = [...seed, ...written];
  expect(all).toHaveLength(70);
  for (const id of all) expect(seen.get(id)).toBe(1);
  expect([...seen.values()].every((n) => n === 1)).toBe(true);
});
