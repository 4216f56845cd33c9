// What this proves: with BLOB_STORE=s3 (configured as the server reads it, against the s3rver fake, a real S3
// protocol server), every path of a clip's bytes goes through object storage: an upload started through one
// instance and finished through another (uploads in progress live in the bucket, @tus/s3-store) is kept with the
// hash the device declared and leaves no upload objects behind; the practitioner hears it; the export carries it;
// the erasure deletes it. Two apps with their own database pools and upload services stand for two instances.
import { createHash, randomUUID } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { encodeWav16 } from '@/shared/analysis/wav';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import { hexToBytes, sealClip, sha256Hex } from '@/shared/seal';
import { startS3Fake } from '@/sync-server/fakes/s3-fake';
import { loadConfig, type Config } from '@/sync-server/src/config/settings';
import { SimDevice, clientFields, sessionFields, siteFields } from './sync-helpers/devices';
import { makeClinic, makeTestContext, tokensFor, type TestContext } from './helpers/test-app';

jest.setTimeout(180_000);
const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-s3-paths-'));
const bucket = `clips-${randomUUID().slice(0, 8)}`;
const prefix = `kept-${randomUUID().slice(0, 8)}/`;
let fake: Awaited<ReturnType<typeof startS3Fake>>;
let s3: S3Client;
let config: Config;
const instances: { ctx: TestContext; url: string; server: http.Server }[] = [];

async function startInstance(jwtSecret?: string) {
  // Nothing chosen: every part is built from the S3 configuration (S3 staging, the S3 blob store).
  const ctx = makeTestContext(jwtSecret ? { jwtSecret } : {}, { config });
  if (jwtSecret) ctx.jwtSecret = jwtSecret;
  const server = http.createServer(ctx.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const instance = { ctx, server, url: `http://127.0.0.1:${(server.address() as AddressInfo).port}` };
  instances.push(instance);
  return instance;
}

beforeAll(async () => {
  fake = await startS3Fake({ port: 0, directory: path.join(workDir, 's3'), buckets: [bucket] });
  s3 = new S3Client({
    endpoint: fake.endpoint,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: fake.credentials,
  });
  config = loadConfig({
    BLOB_STORE: 's3',
    S3_BUCKET: bucket,
    S3_ENDPOINT: fake.endpoint,
    S3_PREFIX: prefix,
    S3_FORCE_PATH_STYLE: 'true',
    S3_ACCESS_KEY_ID: fake.credentials.accessKeyId,
    S3_SECRET_ACCESS_KEY: fake.credentials.secretAccessKey,
    CLINIC_KEYS_DIR: path.join(workDir, 'keys'),
    // A folder that must stay unused in S3 mode.
    UPLOAD_DIR: path.join(workDir, 'uploads'),
    BLOB_DIR: path.join(workDir, 'blobs'),
  });
});
afterAll(async () => {
  for (const { server, ctx } of instances) {
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await ctx.close();
  }
  await fake.close();
  fs.rmSync(workDir, { recursive: true, force: true });
});

// A synthetic 30 s, 16 kHz clip: 40 Hz bursts twice a second (not a heart-sound reference).
function syntheticWav(seconds = 30, rate = 16000): Uint8Array {
  const samples = new Float32Array(seconds * rate);
  for (let i = 0; i < samples.length; i++) {
    const t = i / rate;
    samples[i] =
      t % 0.5 < 0.06 ? 0.5 * Math.sin(2 * Math.PI * 40 * t) : 0.001 * Math.sin(2 * Math.PI * 7 * t);
  }
  return encodeWav16(samples, rate);
}

const bucketKeys = async () =>
  ((await s3.send(new ListObjectsV2Command({ Bucket: bucket }))).Contents ?? []).map((o) => o.Key!);

const binary = (req: request.Test) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

test('with BLOB_STORE=s3: an upload begun on one instance and finished on another is kept with its hash, then heard, exported and erased', async () => {
  const a = await startInstance();
  const b = await startInstance(a.ctx.jwtSecret);
  const clinic = await makeClinic('S3Paths');
  const tokens = await tokensFor(a.ctx.app, clinic);
  const headers = {
    authorization: `Bearer ${tokens.operator}`,
    [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION),
    'tus-resumable': '1.0.0',
  };

  // The records first, as the phone sends them, through instance A.
  const key = await request(a.ctx.app).get('/api/clinic/public-key').set(headers);
  const wav = syntheticWav();
  const sealed = sealClip(wav, hexToBytes(key.body.publicKey));
  const hash = sha256Hex(sealed);
  const device = new SimDevice(a.url, tokens.operator);
  const clientId = await device.create('clients', clientFields('s3'));
  const sessionId = await device.create('recording_sessions', sessionFields(clientId));
  await device.create('site_recordings', siteFields(sessionId, 'mitral', hash));
  expect((await device.sync()).error).toBeUndefined();

  // tus 1.0: created and half sent through A ...
  const created = await request(a.url)
    .post('/api/sync/uploads')
    .set(headers)
    .set('upload-length', String(sealed.length))
    .set('upload-metadata', `sha256 ${Buffer.from(hash).toString('base64')}`);
  expect(created.status).toBe(201);
  const uploadPath = new URL(created.headers.location, 'http://x').pathname;
  const half = Math.floor(sealed.length / 2);
  const first = await request(a.url)
    .patch(uploadPath)
    .set(headers)
    .set('upload-offset', '0')
    .set('content-type', 'application/offset+octet-stream')
    .send(Buffer.from(sealed.subarray(0, half)));
  expect(first.status).toBe(204);
  // ... the bookkeeping is in the bucket, nothing on local disk ...
  expect((await bucketKeys()).some((k) => k.endsWith('.info'))).toBe(true);
  expect(fs.existsSync(path.join(workDir, 'uploads'))).toBe(false);

  // ... and B, which never saw it, knows the offset and takes the rest.
  const head = await request(b.url).head(uploadPath).set(headers);
  expect(head.status).toBe(200);
  expect(head.headers['upload-offset']).toBe(String(half));
  const rest = await request(b.url)
    .patch(uploadPath)
    .set(headers)
    .set('upload-offset', String(half))
    .set('content-type', 'application/offset+octet-stream')
    .send(Buffer.from(sealed.subarray(half)));
  expect(rest.status).toBe(204);

  // Kept: the object under the blob prefix hashes (SHA-256, FIPS 180-4 via node:crypto) to the declared hash, and
  // no upload object is left.
  const [blob] = await a.ctx.sequelize.query<{ storage_key: string; state: string }>(
    'SELECT storage_key, state FROM clip_blobs WHERE sha256 = :hash AND clinic_id = :clinicId',
    { type: QueryTypes.SELECT, replacements: { hash, clinicId: clinic.id } },
  );
  expect(blob.state).toBe('stored');
  const object = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: `${prefix}${blob.storage_key}` }));
  const kept = Buffer.from(await object.Body!.transformToByteArray());
  expect(createHash('sha256').update(kept).digest('hex')).toBe(hash);
  expect(await bucketKeys()).toEqual([`${prefix}${blob.storage_key}`]);
  expect(fs.existsSync(path.join(workDir, 'blobs'))).toBe(false);

  // Read: the practitioner hears the WAV recorded, opened from the sealed object.
  const audio = await binary(
    request(b.ctx.app)
      .get(`/api/review/sessions/${sessionId}/sites/mitral/audio`)
      .set('authorization', `Bearer ${tokens.practitioner}`),
  );
  expect(audio.status).toBe(200);
  expect(Buffer.compare(audio.body as Buffer, Buffer.from(wav))).toBe(0);

  // Export: the zip (read back by Debian's Info-ZIP unzip) carries the same WAV.
  const exported = await binary(
    request(a.ctx.app)
      .get(`/api/client-records/${clientId}/export`)
      .set('authorization', `Bearer ${tokens.admin}`),
  );
  expect(exported.status).toBe(200);
  const dir = fs.mkdtempSync(path.join(workDir, 'export-'));
  fs.writeFileSync(path.join(dir, 'export.zip'), exported.body as Buffer);
  execFileSync('unzip', ['-q', path.join(dir, 'export.zip'), '-d', dir]);
  const wavName = fs
    .readdirSync(dir, { recursive: true })
    .map(String)
    .find((f) => f.startsWith('clips/') && f.endsWith('.wav'))!;
  expect(fs.readFileSync(path.join(dir, wavName)).equals(Buffer.from(wav))).toBe(true);

  // Erasure: the object is gone from the bucket.
  const [names] = await a.ctx.sequelize.query<{ name: string }>(
    `SELECT first_name || ' ' || last_name AS name FROM clients WHERE id = :clientId`,
    { type: QueryTypes.SELECT, replacements: { clientId } },
  );
  const erased = await request(a.ctx.app)
    .post(`/api/client-records/${clientId}/erase`)
    .set('authorization', `Bearer ${tokens.admin}`)
    .send({ confirmName: names.name });
  expect(erased.status).toBe(200);
  expect(erased.body.blobsDeleted).toBe(1);
  expect(await bucketKeys()).toEqual([]);
});
