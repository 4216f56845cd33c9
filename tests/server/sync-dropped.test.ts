// What this proves: when the answer to a committed push is lost on the way back, the retry applies nothing twice
// and the device settles on the server's state; a soak of 1000 pushes from 20 devices over a network that drops
// connections at random loses nothing, duplicates nothing, and leaves every device equal to the server.
import { QueryTypes } from 'sequelize';
import { CuttingProxy } from './sync-helpers/cutting-proxy';
import {
  SimDevice,
  clientFields,
  clinicWithTokens,
  startSyncServer,
  type SyncTestServer,
} from './sync-helpers/devices';

let server: SyncTestServer;
let proxy: CuttingProxy;
beforeAll(async () => {
  server = await startSyncServer();
  proxy = new CuttingProxy(server.url);
  await proxy.start();
});
afterAll(async () => {
  await proxy.stop();
  await server.close();
});

test('when the response to a committed push is cut, then the retry answers already applied and no row or version is doubled', async () => {
  const { clinic, operator } = await clinicWithTokens(server, 'Dropped');
  const device = new SimDevice(proxy.url, operator);
  const id = await device.create('clients', clientFields('drop'));
  let cut = 0;
  proxy.decide = (req) => (req.url === '/api/sync/push' && cut++ === 0 ? 'drop-response' : 'pass');
  const first = await device.sync();
  expect(first.error).toBeDefined();
  expect((await device.storage.listOutbox())[0]).toMatchObject({ state: 'waiting', attempts: 1 });
  // The server committed although the device never heard back.
  const [row] = await server.ctx.sequelize.query<{ version: number }>(
    `SELECT version FROM clients WHERE id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  expect(row.version).toBe(1);

  await device.syncUntilSettled();
  expect((await device.storage.listOutbox())[0]).toMatchObject({ state: 'sent', attempts: 2 });
  await device.edit('clients', id, { phone: 'after the cut' });
  expect(await device.sync()).toMatchObject({ sent: 1, conflicts: 0 });
  const rows = await server.ctx.sequelize.query<{ version: number }>(
    `SELECT version FROM clients WHERE clinic_id = $1`,
    {
      bind: [clinic.id],
      type: QueryTypes.SELECT,
    },
  );
  expect(rows).toEqual([{ version: 2 }]);
});

test('when 20 devices push 1000 changes through a network that drops connections at random, then none is lost or doubled and every device equals the server', async () => {
  const { clinic, operator } = await clinicWithTokens(server, 'Soak');
  let seed = 42;
  // A small linear congruential generator, so a failing run can be replayed.
  const random = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
  proxy.decide = () => {
    const r = random();
    return r < 0.1 ? 'drop-response' : r < 0.2 ? 'refuse' : 'pass';
  };
  const devices = Array.from({ length: 20 }, () => new SimDevice(proxy.url, operator, { batchSize: 10 }));
  const created: string[] = [];
  const edits = new Map<string, string>();
  // 20 devices x (30 creates + 20 edits of their own rows) = 1000 pushed changes.
  await Promise.all(
    devices.map(async (device, d) => {
      const mine: string[] = [];
      for (let i = 0; i < 30; i++) mine.push(await device.create('clients', clientFields(`soak${d}-${i}`)));
      created.push(...mine);
      await device.syncUntilSettled();
      for (let i = 0; i < 20; i++) {
        const note = `edit ${d}-${i}`;
        await device.edit('clients', mine[i], { phone: note });
        edits.set(mine[i], note);
        if (i % 5 === 4) await device.syncUntilSettled();
      }
      await device.syncUntilSettled();
    }),
  );
  proxy.decide = () => 'pass';
  await Promise.all(devices.map((d) => d.sync()));

  const serverRows = await server.ctx.sequelize.query<{ id: string; version: number; phone: string | null }>(
    `SELECT id, version, phone FROM clients WHERE clinic_id = $1 ORDER BY id`,
    { bind: [clinic.id], type: QueryTypes.SELECT },
  );
  expect(serverRows).toHaveLength(600);
  expect(new Set(serverRows.map((r) => r.id))).toEqual(new Set(created));
  for (const row of serverRows) {
    expect(row.version).toBe(edits.has(row.id) ? 2 : 1);
    expect(row.phone).toBe(edits.get(row.id) ?? null);
  }
  const [{ count }] = await server.ctx.sequelize.query<{ count: string }>(
    `SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`,
    {
      bind: [clinic.id],
      type: QueryTypes.SELECT,
    },
  );
  expect(Number(count)).toBe(1000);
  for (const device of devices) {
    const outbox = await device.storage.listOutbox();
    expect(outbox.filter((i) => i.state !== 'sent')).toEqual([]);
    const local = device.storage
      .allConfirmedRows()
      .map((r) => ({ id: r.id, version: r.version, phone: r.data.phone ?? null }))
      .sort((a, b) => (a.id < b.id ? -1 : 1));
    expect(local).toEqual(serverRows);
  }
});
