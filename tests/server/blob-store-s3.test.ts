// What this proves: the S3 blob store and the local-disk store keep the same contract (content-addressed put,
// get, exists, delete, a missing key), the S3 one against a real S3 protocol server (the s3rver fake, in this
// process), and the configuration picks the store.
import { randomBytes, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { GetObjectCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import { startS3Fake } from '@/sync-server/fakes/s3-fake';
import { LocalDiskBlobStore, type BlobStore } from '@/sync-server/src/services/blob-store';
import { blobStoreFrom } from '@/sync-server/src/composition-root';
import { loadConfig, type Env } from '@/sync-server/src/config/settings';
import { S3BlobStore } from '@/sync-server/src/services/blob-store-s3';

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-blob-store-'));
const bucket = `clips-${randomUUID().slice(0, 8)}`;
let fake: Awaited<ReturnType<typeof startS3Fake>>;

beforeAll(async () => {
  fake = await startS3Fake({ port: 0, directory: path.join(workDir, 's3'), buckets: [bucket] });
});
afterAll(async () => {
  await fake.close();
  fs.rmSync(workDir, { recursive: true, force: true });
});

const s3Store = (prefix = `run-${randomUUID().slice(0, 8)}/`) =>
  new S3BlobStore({ bucket, endpoint: fake.endpoint, credentials: fake.credentials, prefix });

// Unique bytes per test, so no test reads another's blob.
const uniqueBytes = (size = 4096) => new Uint8Array(randomBytes(size));

function blobStoreContract(name: string, makeStore: () => BlobStore) {
  describe(`${name} blob store`, () => {
    test('when bytes are put, then the key is their sha256 and get returns the same bytes', async () => {
      const store = makeStore();
      // FIPS 180-2, appendix B.1: SHA-256("abc").
      const abc = new TextEncoder().encode(`abc`);
      const known = await store.put(abc);
      expect(known.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
      expect(known.storageKey).toBe(`ba/${known.sha256}`);
      expect(known.sizeBytes).toBe(3);
      expect(Buffer.from((await store.get(known.storageKey))!).toString()).toBe('abc');

      const bytes = uniqueBytes(200_000);
      const stored = await store.put(bytes);
      expect(Buffer.compare((await store.get(stored.storageKey))!, Buffer.from(bytes))).toBe(0);
    });

    test('when the same bytes are put twice, then both answers name one blob and it still reads back', async () => {
      const store = makeStore();
      const bytes = uniqueBytes();
      const first = await store.put(bytes);
      const second = await store.put(bytes);
      expect(second).toEqual(first);
      expect(Buffer.compare((await store.get(first.storageKey))!, Buffer.from(bytes))).toBe(0);
    });

    test('when a key was stored, then it exists; when it was not, then it does not and get answers null', async () => {
      const store = makeStore();
      const stored = await store.put(uniqueBytes());
      expect(await store.has(stored.storageKey)).toBe(true);
      const absent = `ab/ab${'0'.repeat(62)}`;
      expect(await store.has(absent)).toBe(false);
      expect(await store.get(absent)).toBeNull();
    });

    test('when a blob is deleted, then it is gone, and deleting it again is not an error', async () => {
      const store = makeStore();
      const kept = await store.put(uniqueBytes());
      const erased = await store.put(uniqueBytes());
      await store.delete(erased.storageKey);
      expect(await store.has(erased.storageKey)).toBe(false);
      expect(await store.get(erased.storageKey)).toBeNull();
      await expect(store.delete(erased.storageKey)).resolves.toBeUndefined();
      expect(await store.has(kept.storageKey)).toBe(true);
    });

    test('when a key is not a blob key, then the store refuses it instead of reading elsewhere', async () => {
      const store = makeStore();
      await expect(store.get('../../etc/passwd')).rejects.toThrow('Not a blob key');
      await expect(store.delete('ab/not-a-hash')).rejects.toThrow('Not a blob key');
    });
  });
}

blobStoreContract('local-disk', () => new LocalDiskBlobStore(path.join(workDir, `disk-${randomUUID()}`)));
blobStoreContract('S3', () => s3Store());

describe('S3 blob store specifics', () => {
  test('when a blob is put, then the object sits in the bucket under the prefix and its key', async () => {
    const prefix = `clinic-${randomUUID().slice(0, 8)}/`;
    const store = s3Store(prefix);
    const bytes = uniqueBytes();
    const { storageKey } = await store.put(bytes);
    const listed = await store.client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix }));
    expect(listed.Contents?.map((o) => o.Key)).toEqual([`${prefix}${storageKey}`]);
    const raw = await store.client.send(
      new GetObjectCommand({ Bucket: bucket, Key: `${prefix}${storageKey}` }),
    );
    expect(Buffer.compare(Buffer.from(await raw.Body!.transformToByteArray()), Buffer.from(bytes))).toBe(0);
  });

  test('when a client signs with the key pair s3rver publishes, then the fake refuses it', async () => {
    // s3rver's README documents S3RVER / S3RVER as its accepted pair; ours makes its own per start instead.
    const published = new S3BlobStore({
      bucket,
      endpoint: fake.endpoint,
      credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    });
    // 403 Forbidden (RFC 9110 §15.5.4): the request is understood and refused.
    await expect(published.put(uniqueBytes())).rejects.toMatchObject({ $metadata: { httpStatusCode: 403 } });
  });

  test('when the object store is unreachable, then reads fail loudly rather than answering "missing"', async () => {
    const closed = await startS3Fake({
      port: 0,
      directory: path.join(workDir, 's3-closed'),
      buckets: [bucket],
    });
    await closed.close();
    const store = new S3BlobStore({ bucket, endpoint: closed.endpoint, credentials: closed.credentials });
    await expect(store.has(`ab/ab${'0'.repeat(62)}`)).rejects.toThrow();
    await expect(store.get(`ab/ab${'0'.repeat(62)}`)).rejects.toThrow();
  });
});

describe('blob store configuration', () => {
  // Read as the server reads it: the configuration module, then the composition root.
  const blobStoreFromEnv = (env: Env) => blobStoreFrom(loadConfig(env));

  test('when BLOB_STORE is unset, then clips stay on local disk', () => {
    expect(blobStoreFromEnv({ BLOB_DIR: path.join(workDir, 'default') })).toBeInstanceOf(LocalDiskBlobStore);
  });

  test('when BLOB_STORE=s3 with an endpoint and bucket, then the S3 store writes to that bucket', async () => {
    const store = blobStoreFromEnv({
      BLOB_STORE: 's3',
      S3_ENDPOINT: fake.endpoint,
      S3_BUCKET: bucket,
      S3_PREFIX: `configured-${randomUUID().slice(0, 8)}/`,
      S3_ACCESS_KEY_ID: fake.credentials.accessKeyId,
      S3_SECRET_ACCESS_KEY: fake.credentials.secretAccessKey,
      BLOB_DIR: path.join(workDir, 'unused'),
    });
    expect(store).toBeInstanceOf(S3BlobStore);
    const bytes = uniqueBytes();
    const { storageKey } = await store.put(bytes);
    expect(Buffer.compare((await store.get(storageKey))!, Buffer.from(bytes))).toBe(0);
    expect(fs.existsSync(path.join(workDir, 'unused'))).toBe(false);
  });

  test('when the S3 configuration is incomplete or unknown, then start-up says what is missing', () => {
    expect(() => blobStoreFromEnv({ BLOB_STORE: 's3' })).toThrow('needs S3_BUCKET');
    expect(() => blobStoreFromEnv({ BLOB_STORE: 's3', S3_BUCKET: 'b', S3_ACCESS_KEY_ID: 'k' })).toThrow(
      'Set both S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY',
    );
    expect(() => blobStoreFromEnv({ BLOB_STORE: 'ftp' })).toThrow('must be "local" or "s3"');
  });
});
