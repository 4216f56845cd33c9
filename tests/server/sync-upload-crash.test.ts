// What this proves: when the server process is killed (SIGKILL) after an upload's last byte is written and before
// the clip is processed, the clip is not lost. The device does not count it as sent on the server's "complete"
// alone; after a restart the clip is processed by the start-up scan of the staging folder, or else by the
// device's HEAD, and only then does the device count it as sent. Nothing is uploaded twice (no new POST).
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import readline from 'node:readline';
import { QueryTypes } from 'sequelize';
import { encodeWav16 } from '@/shared/analysis/wav';
import { sealClip, sha256Hex } from '@/shared/seal';
import { clipItem, createHttpTransport } from '@/shared/sync';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { clipWorker } from '@/sync-server/src/services/clip-worker';
import { makeClinic, makeTestContext, signIn, type TestContext } from './helpers/test-app';
import { CuttingProxy } from './sync-helpers/cutting-proxy';
import { SimDevice, clientFields, sessionFields, siteFields } from './sync-helpers/devices';

const SERVER_ENTRY = path.join(__dirname, 'sync-helpers/upload-server-process.ts');
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-crash-'));
const uploadsDir = path.join(dataDir, 'uploads');
let ctx: TestContext;
let child: ChildProcess | null = null;
let port = 0;
let proxy: CuttingProxy;

beforeAll(() => {
  ctx = makeTestContext();
});
afterAll(async () => {
  child?.kill('SIGKILL');
  await proxy?.stop();
  await clipWorker().close();
  await ctx.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

/** Starts the server process and waits for its "listening" line. */
async function startServer(mode: { killAfterLastByte?: boolean; skipStartupScan?: boolean } = {}) {
  // tsx as a loader, not its CLI (which runs the script in a child of its own): the kill reaches the server itself.
  const started = spawn(process.execPath, ['--import', 'tsx', SERVER_ENTRY], {
    env: {
      ...process.env,
      JWT_SECRET: ctx.jwtSecret,
      DATA_DIR: dataDir,
      PORT: String(port),
      KILL_AFTER_LAST_BYTE: mode.killAfterLastByte ? '1' : '',
      SKIP_STARTUP_SCAN: mode.skipStartupScan ? '1' : '',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  child = started;
  const line = await new Promise<string>((resolve, reject) => {
    readline.createInterface({ input: started.stdout! }).once('line', resolve);
    started.once('exit', (code) => reject(new Error(`the server process exited (${code}) before listening`)));
  });
  const ready = JSON.parse(line) as { port: number; scan: { stored: number; refused: number } | null };
  port = ready.port;
  const exited = new Promise<NodeJS.Signals | null>((resolve) =>
    started.once('exit', (_code, signal) => resolve(signal)),
  );
  return { ...ready, exited };
}

// A synthetic 20 s, 4 kHz clip (bursts twice a second; not a heart-sound reference), unique per call.
function syntheticWav(): Uint8Array {
  const rate = 4000;
  const samples = new Float32Array(20 * rate);
  const offset = Math.random();
  for (let i = 0; i < samples.length; i++) {
    const t = i / rate;
    samples[i] = (t + offset) % 0.5 < 0.06 ? 0.5 * Math.sin(2 * Math.PI * 40 * t) : 0.001;
  }
  return encodeWav16(samples, rate);
}

async function clipOnDevice(device: SimDevice, clinicKey: Uint8Array) {
  const sealed = sealClip(syntheticWav(), clinicKey);
  const hash = sha256Hex(sealed);
  const clientId = await device.create('clients', clientFields('crash'));
  const sessionId = await device.create('recording_sessions', sessionFields(clientId));
  const siteId = await device.create('site_recordings', siteFields(sessionId, 'mitral', hash));
  device.storage.putBlob(hash, sealed);
  const itemId = randomUUID();
  await device.storage.putOutboxItem(
    clipItem({ id: itemId, rowId: siteId, blobHash: hash, sizeBytes: sealed.length, now: Date.now() + 10 }),
  );
  return { sealed, hash, siteId, itemId };
}

const blobRow = async (hash: string) =>
  (
    await ctx.sequelize.query<{ state: string; storage_key: string | null }>(
      `SELECT state, storage_key FROM clip_blobs WHERE sha256 = $1`,
      { bind: [hash], type: QueryTypes.SELECT },
    )
  )[0] ?? null;

const siteRow = async (siteId: string) =>
  (
    await ctx.sequelize.query<{ clip_state: string; analysis: { source?: string } | null }>(
      `SELECT clip_state, analysis FROM site_recordings WHERE id = $1`,
      { bind: [siteId], type: QueryTypes.SELECT },
    )
  )[0];

/** Syncs the device until its first upload kills the server, and checks what each side holds then. */
async function killDuringUpload(
  server: Awaited<ReturnType<typeof startServer>>,
  device: SimDevice,
  clip: Awaited<ReturnType<typeof clipOnDevice>>,
) {
  const report = await device.sync();
  expect(await server.exited).toBe('SIGKILL');
  expect(report.error).toBeDefined();
  // Every byte is staged, nothing is processed, and the device does not count the clip as sent.
  const staged = fs
    .readdirSync(uploadsDir)
    .filter((name) => name.includes(clip.hash) && !name.endsWith('.json'));
  expect(staged).toHaveLength(1);
  expect(fs.statSync(path.join(uploadsDir, staged[0])).size).toBe(clip.sealed.length);
  expect(await blobRow(clip.hash)).toBeNull();
  const item = (await device.storage.listOutbox()).find((i) => i.id === clip.itemId)!;
  expect(item.state).toBe('waiting');
  return staged[0];
}

async function expectProcessed(device: SimDevice, clip: Awaited<ReturnType<typeof clipOnDevice>>) {
  expect(await blobRow(clip.hash)).toMatchObject({
    state: 'stored',
    storage_key: `${clip.hash.slice(0, 2)}/${clip.hash}`,
  });
  const kept = fs.readFileSync(path.join(dataDir, 'blobs', clip.hash.slice(0, 2), clip.hash));
  expect(sha256Hex(new Uint8Array(kept))).toBe(clip.hash);
  expect(await siteRow(clip.siteId)).toMatchObject({ clip_state: 'stored', analysis: { source: 'server' } });
  expect(fs.readdirSync(uploadsDir).filter((name) => name.includes(clip.hash))).toEqual([]);
  expect((await device.storage.listOutbox()).find((i) => i.id === clip.itemId)).toMatchObject({
    state: 'sent',
  });
}

test('when the server dies between the last byte and processing, then a restart processes the clip (start-up scan, else HEAD) and only then does the device count it as sent', async () => {
  const clinic = await makeClinic('Crash');
  const operator = (await signIn(ctx.app, clinic.users.operator.email)).accessToken;

  // The clinic key the server processes will read from the shared data folder.
  const key = new ClinicKeyStore(path.join(dataDir, 'keys')).publicKey(clinic.id);
  let server = await startServer({ killAfterLastByte: true });
  proxy = new CuttingProxy(`http://127.0.0.1:${port}`);
  await proxy.start();
  const device = new SimDevice(proxy.url, operator, {
    transport: createHttpTransport({
      baseUrl: proxy.url,
      getAccessToken: () => operator,
      chunkSize: 64 * 1024,
    }),
  });

  // Restarted without the scan: the device's HEAD is what finds the staged clip and has it processed.
  const byHead = await clipOnDevice(device, key);
  await killDuringUpload(server, device, byHead);
  server = await startServer({ skipStartupScan: true });
  expect(server.scan).toBeNull();
  expect(await blobRow(byHead.hash)).toBeNull();
  let before = proxy.log.length;
  await device.syncUntilSettled();
  let uploads = proxy.log.slice(before).filter((l) => l.path.startsWith('/api/sync/uploads'));
  // Only HEADs: the staged bytes were used, none sent again (no POST, no PATCH).
  expect(uploads.length).toBeGreaterThan(0);
  expect(uploads.filter((l) => l.method !== 'HEAD')).toEqual([]);
  await expectProcessed(device, byHead);
  child!.kill('SIGKILL');
  await server.exited;

  // Restarted with the scan: the clip is stored before the device asks, so the device's first question (the
  // blob's state) already hears "stored" and it sends nothing more.
  const byScan = await clipOnDevice(device, key);
  server = await startServer({ killAfterLastByte: true });
  await killDuringUpload(server, device, byScan);
  server = await startServer();
  expect(server.scan).toEqual({ stored: 1, refused: 0, failed: 0 });
  expect(await blobRow(byScan.hash)).toMatchObject({ state: 'stored' });
  before = proxy.log.length;
  await device.syncUntilSettled();
  uploads = proxy.log.slice(before).filter((l) => l.path.startsWith('/api/sync/uploads'));
  expect(uploads).toEqual([]);
  await expectProcessed(device, byScan);
});
