// What this proves: a sealed clip goes up resumably; when the server dies mid-upload and comes back, the upload
// continues from the offset the server had (no new upload, no byte sent twice past it), the stored blob's hash
// equals the device's, and the server opens the seal and attaches its own analysis; a wrong hash or a clip sealed
// for another key is refused with a reason the outbox shows; an upload the server lost (tus 1.0.0, "Core
// Protocol": 404 or 410 to HEAD or PATCH means the upload is gone) starts again from the beginning and the clip
// is kept once, whole.
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import axios from 'axios';
import { QueryTypes } from 'sequelize';
import { encodeWav16 } from '@/shared/analysis/wav';
import { clipAnalysisSchema, storedTraceSchema } from '@/shared/protocol/analysis';
import { generateClinicKeyPair, hexToBytes, sealClip, sha256Hex } from '@/shared/seal';
import { clipItem, createHttpTransport } from '@/shared/sync';
import { CuttingProxy } from './sync-helpers/cutting-proxy';
import {
  SimDevice,
  clientFields,
  clinicWithTokens,
  sessionFields,
  siteFields,
  startSyncServer,
  type SyncTestServer,
} from './sync-helpers/devices';

let server: SyncTestServer;
afterAll(() => server.close());

// A synthetic 60 s, 16 kHz clip: 40 Hz bursts twice a second, loud enough to decode (not a heart-sound reference).
function syntheticWav(seconds = 60, rate = 16000): Uint8Array {
  const samples = new Float32Array(seconds * rate);
  for (let i = 0; i < samples.length; i++) {
    const t = i / rate;
    const phase = t % 0.5;
    samples[i] = phase < 0.06 ? 0.5 * Math.sin(2 * Math.PI * 40 * t) : 0.001 * Math.sin(2 * Math.PI * 7 * t);
  }
  return encodeWav16(samples, rate);
}

async function clinicKey(url: string, token: string): Promise<Uint8Array> {
  const res = await axios.get(`${url}/api/clinic/public-key`, {
    headers: { authorization: `Bearer ${token}` },
  });
  return hexToBytes(res.data.publicKey);
}

test('when the server is killed mid-upload and restarted, then the upload resumes from its offset and the stored blob hash equals the local one', async () => {
  server = await startSyncServer();
  const port = Number(new URL(server.url).port);
  // A minute of sound, so the upload spans many chunks and can be cut in the middle.
  const { clinic, proxy, device, hash, siteId } = await deviceWithOneClip('Upload', syntheticWav());

  let patches = 0;
  let killed: Promise<void> | null = null;
  proxy.decide = (req) => {
    if (req.method === 'PATCH' && ++patches === 4) {
      killed = server.close(true);
      return 'refuse';
    }
    return killed ? 'refuse' : 'pass';
  };
  const first = await device.sync();
  expect(first.error).toBeDefined();
  await killed;
  const item = (await device.storage.listOutbox()).find((i) => i.kind === 'clip')!;
  expect(item).toMatchObject({ state: 'waiting', uploadUrl: expect.stringContaining('/api/sync/uploads/') });
  expect(item.progress).toBeGreaterThan(0);

  server = await startSyncServer({ dataDir: server.dataDir, jwtSecret: server.ctx.jwtSecret, port });
  proxy.decide = () => 'pass';
  const before = proxy.log.length;
  await device.syncUntilSettled();

  const after = proxy.log.slice(before).filter((l) => l.path.startsWith('/api/sync/uploads'));
  expect(after.some((l) => l.method === 'POST')).toBe(false);
  expect(after[0].method).toBe('HEAD');
  const resumedAt = Number(after.find((l) => l.method === 'PATCH')!.uploadOffset);
  expect(resumedAt).toBe(3 * 64 * 1024);
  expect((await device.storage.listOutbox()).map((i) => i.state)).toEqual(['sent', 'sent', 'sent', 'sent']);

  const [blob] = await server.ctx.sequelize.query<{ storage_key: string; state: string; trace: unknown }>(
    `SELECT storage_key, state, trace FROM clip_blobs WHERE sha256 = $1 AND clinic_id = $2`,
    { bind: [hash, clinic.id], type: QueryTypes.SELECT },
  );
  expect(blob.state).toBe('stored');
  // The display trace is drawn once, when the clip is processed, and kept with it.
  const trace = storedTraceSchema.parse(blob.trace);
  expect(trace.min).toHaveLength(Math.round(trace.durationS * trace.bucketsPerSecond));
  expect(Math.max(...trace.max.map(Math.abs), ...trace.min.map(Math.abs))).toBe(1);
  const kept = await server.services.blobStore.get(blob.storage_key);
  expect(sha256Hex(new Uint8Array(kept!))).toBe(hash);
  const [site] = await server.ctx.sequelize.query<{
    clip_state: string;
    analysis: { source: string; durationS?: number };
  }>(`SELECT clip_state, analysis FROM site_recordings WHERE id = $1`, {
    bind: [siteId],
    type: QueryTypes.SELECT,
  });
  expect(site.clip_state).toBe('stored');
  expect(site.analysis.source).toBe('server');
  expect(clipAnalysisSchema.safeParse(site.analysis).success).toBe(true);
  await proxy.stop();
});

test('when a clip sealed for another key or with a wrong hash is uploaded, then it is refused and the outbox shows why', async () => {
  const { operator } = await clinicWithTokens(server, 'BadClip');
  const device = new SimDevice(server.url, operator);
  const foreign = sealClip(syntheticWav(2), generateClinicKeyPair().publicKey);
  const foreignHash = sha256Hex(foreign);
  device.storage.putBlob(foreignHash, foreign);
  await device.storage.putOutboxItem(
    clipItem({ id: randomUUID(), rowId: randomUUID(), blobHash: foreignHash, sizeBytes: foreign.length }),
  );

  const good = sealClip(syntheticWav(2), await clinicKey(server.url, operator));
  const claimed = sha256Hex(new Uint8Array([1, 2, 3]));
  device.storage.putBlob(claimed, good);
  await device.storage.putOutboxItem(
    clipItem({ id: randomUUID(), rowId: randomUUID(), blobHash: claimed, sizeBytes: good.length }),
  );

  await device.sync();
  const [a, b] = await device.storage.listOutbox();
  expect(a).toMatchObject({
    state: 'failed',
    lastError: expect.stringContaining('sealed for another clinic key'),
  });
  expect(b).toMatchObject({ state: 'failed', lastError: expect.stringContaining('does not match its hash') });
});

/** A device behind a cutting proxy with one sealed clip (and its client, session and site rows) to send. */
async function deviceWithOneClip(label: string, wav = syntheticWav(20)) {
  // The server of the tests above, or one of its own when these run alone (jest -t).
  server ??= await startSyncServer();
  const { clinic, operator } = await clinicWithTokens(server, label);
  const proxy = new CuttingProxy(server.url);
  await proxy.start();
  const device = new SimDevice(proxy.url, operator, {
    transport: createHttpTransport({
      baseUrl: proxy.url,
      getAccessToken: () => operator,
      chunkSize: 64 * 1024,
    }),
  });
  const sealed = sealClip(wav, await clinicKey(server.url, operator));
  const hash = sha256Hex(sealed);
  const clientId = await device.create('clients', clientFields(label));
  const sessionId = await device.create('recording_sessions', sessionFields(clientId));
  const siteId = await device.create('site_recordings', siteFields(sessionId, 'mitral', hash));
  device.storage.putBlob(hash, sealed);
  await device.storage.putOutboxItem(
    clipItem({
      id: randomUUID(),
      rowId: siteId,
      blobHash: hash,
      sizeBytes: sealed.length,
      now: Date.now() + 10,
    }),
  );
  return { clinic, proxy, device, hash, siteId };
}

/** What the server's staging folder holds for one upload URL, removed as a server that lost it would have. */
function loseStagedUpload(uploadPath: string): void {
  const uploadId = decodeURIComponent(uploadPath.split('/').pop()!);
  const staged = path.join(server.dataDir, 'uploads', uploadId);
  expect(fs.existsSync(`${staged}.json`)).toBe(true);
  fs.rmSync(staged, { force: true });
  fs.rmSync(`${staged}.json`, { force: true });
}

async function expectKeptOnce(clinicId: string, hash: string, siteId: string): Promise<void> {
  const blobs = await server.ctx.sequelize.query<{ storage_key: string; state: string }>(
    `SELECT storage_key, state FROM clip_blobs WHERE sha256 = $1 AND clinic_id = $2`,
    { bind: [hash, clinicId], type: QueryTypes.SELECT },
  );
  expect(blobs).toHaveLength(1);
  expect(blobs[0].state).toBe('stored');
  const kept = await server.services.blobStore.get(blobs[0].storage_key);
  expect(sha256Hex(new Uint8Array(kept!))).toBe(hash);
  const [site] = await server.ctx.sequelize.query<{ clip_state: string }>(
    `SELECT clip_state FROM site_recordings WHERE id = $1`,
    { bind: [siteId], type: QueryTypes.SELECT },
  );
  expect(site.clip_state).toBe('stored');
  // Nothing of either upload is left staged: the lost one is gone and the new one was kept.
  const left = fs.readdirSync(path.join(server.dataDir, 'uploads')).filter((name) => name.includes(hash));
  expect(left).toEqual([]);
}

test('when the server loses an upload between two pieces, then the next piece meets 404 and the clip goes up again from the beginning in the same sync, kept once', async () => {
  const { clinic, proxy, device, hash, siteId } = await deviceWithOneClip('lostmid');
  let patches = 0;
  proxy.decide = (req) => {
    if (req.method === 'PATCH' && ++patches === 3) loseStagedUpload(req.url!);
    return 'pass';
  };
  const report = await device.sync();
  expect(report.error).toBeUndefined();
  expect((await device.storage.listOutbox()).map((i) => i.state)).toEqual(['sent', 'sent', 'sent', 'sent']);

  const uploads = proxy.log.filter((l) => l.path.startsWith('/api/sync/uploads'));
  const posts = uploads.filter((l) => l.method === 'POST');
  expect(posts).toHaveLength(2);
  // The second upload starts at byte 0 under a new URL, after the piece that found the first one gone.
  const second = uploads.indexOf(posts[1]);
  expect(uploads[second - 1]).toMatchObject({ method: 'PATCH', uploadOffset: String(2 * 64 * 1024) });
  expect(uploads[second + 1]).toMatchObject({ method: 'PATCH', uploadOffset: '0' });
  expect(uploads[second + 1].path).not.toBe(uploads[second - 1].path);
  await expectKeptOnce(clinic.id, hash, siteId);
  await proxy.stop();
});

test('when the server lost an upload while the device was away, then the resume asks (HEAD), meets 404 and a new upload carries the whole clip, kept once', async () => {
  const { clinic, proxy, device, hash, siteId } = await deviceWithOneClip('lostaway');
  let patches = 0;
  proxy.decide = (req) => (req.method === 'PATCH' && ++patches === 3 ? 'refuse' : 'pass');
  await device.sync();
  const waiting = (await device.storage.listOutbox()).find((i) => i.kind === 'clip')!;
  expect(waiting).toMatchObject({
    state: 'waiting',
    uploadUrl: expect.stringContaining('/api/sync/uploads/'),
  });
  loseStagedUpload(new URL(waiting.uploadUrl!).pathname);

  proxy.decide = () => 'pass';
  const before = proxy.log.length;
  await device.syncUntilSettled();
  const uploads = proxy.log.slice(before).filter((l) => l.path.startsWith('/api/sync/uploads'));
  expect(uploads.slice(0, 3).map((l) => [l.method, l.uploadOffset])).toEqual([
    ['HEAD', undefined],
    ['POST', undefined],
    ['PATCH', '0'],
  ]);
  expect((await device.storage.listOutbox()).map((i) => i.state)).toEqual(['sent', 'sent', 'sent', 'sent']);
  await expectKeptOnce(clinic.id, hash, siteId);
  await proxy.stop();
});
