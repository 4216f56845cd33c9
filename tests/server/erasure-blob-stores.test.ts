// What this proves: erasing a client deletes its clips from whichever blob store is configured, local disk and
// S3 (the s3rver fake, a real S3 protocol server, in this process); when the store is down the delete is recorded
// with its error, the erasure still stands, and the purge deletes the bytes once the store is back.
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { startS3Fake } from '@/sync-server/fakes/s3-fake';
import { LocalDiskBlobStore, type BlobStore } from '@/sync-server/src/services/blob-store';
import { S3BlobStore } from '@/sync-server/src/services/blob-store-s3';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { purgeErased } from '@/sync-server/src/use-cases/clients/erase-client';
import { makeClinic, makeTestContext, tokensFor, type TestContext } from './helpers/test-app';
import { insertClient, insertSession } from './helpers/practice-rows';

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-erase-'));
const bucket = `clips-${randomUUID().slice(0, 8)}`;
let fake: Awaited<ReturnType<typeof startS3Fake>>;

beforeAll(async () => {
  fake = await startS3Fake({ port: 0, directory: path.join(workDir, 's3'), buckets: [bucket] });
});
afterAll(async () => {
  await fake.close();
  fs.rmSync(workDir, { recursive: true, force: true });
});

/** A client with one stored clip, as the sync side leaves it (bytes in the store, a row naming them). */
async function clientWithClip(ctx: TestContext, store: BlobStore, clinicId: string) {
  const clientId = await insertClient(ctx.sequelize, clinicId);
  const sessionId = await insertSession(ctx.sequelize, clinicId, clientId, { status: 'reviewed' });
  const stored = await store.put(new TextEncoder().encode(`sealed clip ${randomUUID()}`));
  await ctx.sequelize.query(
    `INSERT INTO clip_blobs (sha256, clinic_id, size_bytes, content_type, storage_key, state)
     VALUES (:sha, :clinicId, :size, 'application/x-fourpoint-sealed', :key, 'stored')`,
    { replacements: { sha: stored.sha256, clinicId, size: stored.sizeBytes, key: stored.storageKey } },
  );
  await ctx.sequelize.query(
    `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, clip_sha256, clip_state, duration_s, recorded_at)
     VALUES (:id, :clinicId, :sessionId, 'mitral', 'good', :sha, 'stored', 1, now())`,
    { replacements: { id: randomUUID(), clinicId, sessionId, sha: stored.sha256 } },
  );
  const [names] = await ctx.sequelize.query<{ name: string }>(
    `SELECT first_name || ' ' || last_name AS name FROM clients WHERE id = :clientId`,
    { replacements: { clientId }, type: QueryTypes.SELECT },
  );
  return { clientId, storageKey: stored.storageKey, name: names.name };
}

const pendingDeletes = (ctx: TestContext, storageKey: string) =>
  ctx.sequelize.query<{ attempts: number; last_error: string | null }>(
    `SELECT attempts, last_error FROM blob_deletions WHERE storage_key = :storageKey`,
    { replacements: { storageKey }, type: QueryTypes.SELECT },
  );

describe.each([
  ['local disk', () => new LocalDiskBlobStore(path.join(workDir, `local-${randomUUID()}`))],
  [
    'S3',
    () =>
      new S3BlobStore({
        bucket,
        endpoint: fake.endpoint,
        credentials: fake.credentials,
        prefix: `run-${randomUUID().slice(0, 8)}/`,
      }),
  ],
] as const)('erasure with the %s blob store', (_name, makeStore) => {
  let ctx: TestContext;
  let store: BlobStore;
  beforeAll(() => {
    store = makeStore();
    ctx = makeTestContext(
      {},
      {
        services: { blobStore: store, clinicKeys: new ClinicKeyStore(path.join(workDir, 'keys')) },
      },
    );
  });
  afterAll(() => ctx.close());

  test('when the admin erases a client, then its clip is gone from the store and nothing waits to be deleted', async () => {
    const clinic = await makeClinic('EraseStore');
    const { admin } = await tokensFor(ctx.app, clinic);
    const { clientId, storageKey, name } = await clientWithClip(ctx, store, clinic.id);
    expect(await store.has(storageKey)).toBe(true);

    const res = await request(ctx.app)
      .post(`/api/client-records/${clientId}/erase`)
      .set('authorization', `Bearer ${admin}`)
      .send({ confirmName: name });
    expect(res.status).toBe(200);
    expect(res.body.blobsDeleted).toBe(1);
    expect(await store.has(storageKey)).toBe(false);
    if (store instanceof S3BlobStore) {
      // Listed with the S3 API itself: no object is left under the key.
      const listed = await store.client.send(new ListObjectsV2Command({ Bucket: bucket }));
      expect((listed.Contents ?? []).filter((o) => o.Key?.endsWith(storageKey))).toEqual([]);
    }
    expect(await pendingDeletes(ctx, storageKey)).toEqual([]);
  });
});

test('when S3 is down during an erasure, then the delete is recorded with its error and the purge deletes the clip once S3 is back', async () => {
  const s3Dir = path.join(workDir, 's3-outage');
  const outageFake = await startS3Fake({ port: 0, directory: s3Dir, buckets: [bucket] });
  const store = new S3BlobStore({
    bucket,
    endpoint: outageFake.endpoint,
    credentials: outageFake.credentials,
  });
  const ctx = makeTestContext(
    {},
    {
      services: { blobStore: store, clinicKeys: new ClinicKeyStore(path.join(workDir, 'keys')) },
    },
  );
  const clinic = await makeClinic('EraseOutage');
  const { admin } = await tokensFor(ctx.app, clinic);
  const { clientId, storageKey, name } = await clientWithClip(ctx, store, clinic.id);

  await outageFake.close();
  const res = await request(ctx.app)
    .post(`/api/client-records/${clientId}/erase`)
    .set('authorization', `Bearer ${admin}`)
    .send({ confirmName: name });
  expect(res.status).toBe(200);
  expect(res.body.blobsDeleted).toBe(0);
  const [pending] = await pendingDeletes(ctx, storageKey);
  expect(pending.attempts).toBe(1);
  expect(pending.last_error).toEqual(expect.any(String));

  const back = await startS3Fake({ port: outageFake.port, directory: s3Dir, buckets: [bucket] });
  try {
    expect(await store.has(storageKey)).toBe(true);
    await purgeErased(ctx, { graceMs: 0, clinicId: clinic.id });
    expect(await store.has(storageKey)).toBe(false);
    expect(await pendingDeletes(ctx, storageKey)).toEqual([]);
  } finally {
    await back.close();
    await ctx.close();
  }
});
