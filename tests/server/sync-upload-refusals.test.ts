// What this proves: a clip the server refuses (not sealed, sealed for another clinic, cut short so it cannot be
// opened, or not matching its hash) leaves no bytes behind: the staged upload and its .json sidecar are removed
// and nothing reaches the blob store, local disk or S3 (the s3rver fake, listed through the S3 API itself). The
// device's outbox shows each reason.
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { QueryTypes } from 'sequelize';
import { encodeWav16 } from '@/shared/analysis/wav';
import { generateClinicKeyPair, sealClip, sha256Hex } from '@/shared/seal';
import { clipItem } from '@/shared/sync';
import { startS3Fake } from '@/sync-server/fakes/s3-fake';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { S3BlobStore } from '@/sync-server/src/services/blob-store-s3';
import { clipWorker } from '@/sync-server/src/services/clip-worker';
import { SimDevice, clinicWithTokens, startSyncServer } from './sync-helpers/devices';

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-refusals-'));
const bucket = `clips-${randomUUID().slice(0, 8)}`;
let fake: Awaited<ReturnType<typeof startS3Fake>>;

beforeAll(async () => {
  fake = await startS3Fake({ port: 0, directory: path.join(workDir, 's3'), buckets: [bucket] });
});
afterAll(async () => {
  await clipWorker().close();
  await fake.close();
  fs.rmSync(workDir, { recursive: true, force: true });
});

// Unique per call: clip rows are keyed by hash, and the test database outlives a run.
const wav = () => {
  const phase = Math.random();
  return encodeWav16(
    new Float32Array(8000).map((_, i) => 0.3 * Math.sin(i / 9 + phase)),
    4000,
  );
};
const filesUnder = (dir: string): string[] =>
  fs.existsSync(dir)
    ? fs
        .readdirSync(dir, { recursive: true })
        .map(String)
        .filter((f) => fs.statSync(path.join(dir, f)).isFile())
    : [];

const localDir = path.join(workDir, 'local-blobs');
const s3Prefix = `run-${randomUUID().slice(0, 8)}/`;

describe.each([
  ['local disk', () => new LocalDiskBlobStore(localDir), async () => filesUnder(localDir)],
  [
    'S3',
    () =>
      new S3BlobStore({ bucket, endpoint: fake.endpoint, credentials: fake.credentials, prefix: s3Prefix }),
    async () => {
      const store = new S3BlobStore({ bucket, endpoint: fake.endpoint, credentials: fake.credentials });
      const listed = await store.client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: s3Prefix }));
      return (listed.Contents ?? []).map((o) => o.Key ?? '');
    },
  ],
] as const)('with the %s blob store', (_name, makeStore, keptObjects) => {
  test('when clips are refused, then no staged file, sidecar or stored blob is left, and the outbox shows each reason', async () => {
    const server = await startSyncServer({ blobStore: makeStore() });
    try {
      const { clinic, operator } = await clinicWithTokens(server, 'Refused');
      const device = new SimDevice(server.url, operator);
      const ownKey = server.services.clinicKeys.publicKey(clinic.id);
      const sealedOwn = sealClip(wav(), ownKey);
      const cases = [
        { bytes: wav(), reason: 'not a sealed Fourpoint clip' },
        {
          bytes: sealClip(wav(), generateClinicKeyPair().publicKey),
          reason: 'sealed for another clinic key',
        },
        { bytes: sealedOwn.subarray(0, 70), reason: 'A sealed clip is at least' },
        {
          bytes: sealedOwn,
          claimed: sha256Hex(new Uint8Array([1, 2, 3])),
          reason: 'does not match its hash',
        },
      ];
      const hashes = cases.map((c) => c.claimed ?? sha256Hex(c.bytes));
      for (const [i, c] of cases.entries()) {
        const hash = hashes[i];
        device.storage.putBlob(hash, c.bytes);
        await device.storage.putOutboxItem(
          clipItem({ id: randomUUID(), rowId: randomUUID(), blobHash: hash, sizeBytes: c.bytes.length }),
        );
      }
      await device.sync();
      const outbox = await device.storage.listOutbox();
      expect(outbox.map((i) => i.state)).toEqual(['failed', 'failed', 'failed', 'failed']);
      cases.forEach((c, i) =>
        expect(outbox.find((item) => item.blobHash === hashes[i])?.lastError).toContain(c.reason),
      );

      expect(filesUnder(path.join(server.dataDir, 'uploads'))).toEqual([]);
      expect(await keptObjects()).toEqual([]);
      // The three that arrived whole but cannot be opened keep a row with the reason and no storage key.
      const rows = await server.ctx.sequelize.query<{ state: string; storage_key: string | null }>(
        `SELECT state, storage_key FROM clip_blobs WHERE clinic_id = $1`,
        { bind: [clinic.id], type: QueryTypes.SELECT },
      );
      expect(rows).toEqual([
        { state: 'failed', storage_key: null },
        { state: 'failed', storage_key: null },
        { state: 'failed', storage_key: null },
      ]);
    } finally {
      await server.close();
    }
  });
});
