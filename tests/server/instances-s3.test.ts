// Three server processes (main.ts, as `INSTANCES=3 npm start` runs them) behind the real load balancer (Debian's
// HAProxy), on a real PostgreSQL, keeping clips in object storage (BLOB_STORE=s3 against the s3rver fake) and
// sending mail to the SMTP fake. What must hold when a clinic's work is spread over instances:
// - an upload started through one instance and finished through another is kept with the hash of the bytes sent;
// - an instance killed (SIGKILL) in the middle of a push loses and doubles nothing once the device has retried
//   through the others;
// - a follow-up reminder that falls due while three instances run the job queue is mailed once.
// Without HAProxy the file says so in one line and skips (npm test's set-up installs it).
import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { QueryTypes } from 'sequelize';
import { encodeWav16 } from '@/shared/analysis/wav';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import { hexToBytes, sealClip } from '@/shared/seal';
import type { SyncReport } from '@/shared/sync/engine';
import { startS3Fake } from '@/sync-server/fakes/s3-fake';
import { startSmtpFake, type SmtpFake } from '@/sync-server/fakes/smtp-fake';
import {
  haproxyMissing,
  isolatedDatabase,
  startBalancedInstances,
  stopAllStarted,
  until,
  type BalancedInstances,
} from './helpers/balanced-instances';
import { makeClinic, makeTestContext, TEST_PASSWORD, type TestContext } from './helpers/test-app';
import { SimDevice, SITES, clientFields, sessionFields, siteFields } from './sync-helpers/devices';

jest.setTimeout(300_000);
const testWithBalancer = haproxyMissing ? test.skip : test;

const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-instances-s3-'));
const bucket = `clips-${randomUUID().slice(0, 8)}`;
const prefix = `kept-${randomUUID().slice(0, 8)}/`;
let database: Awaited<ReturnType<typeof isolatedDatabase>>;
let ctx: TestContext;
let s3Fake: Awaited<ReturnType<typeof startS3Fake>>;
let s3: S3Client;
let smtp: SmtpFake;
let cluster: BalancedInstances;

beforeAll(async () => {
  if (haproxyMissing) return;
  database = await isolatedDatabase();
  ctx = makeTestContext({}, { databaseUrl: database.url });
  s3Fake = await startS3Fake({ port: 0, directory: path.join(workDir, 's3'), buckets: [bucket] });
  s3 = new S3Client({
    endpoint: s3Fake.endpoint,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: s3Fake.credentials,
  });
  smtp = await startSmtpFake();
  cluster = await startBalancedInstances(
    ['i1', 'i2', 'i3'],
    {
      DATABASE_URL: database.url,
      JWT_SECRET: ctx.jwtSecret,
      // One key folder for all, as in a deployment: a clip sealed for the clinic opens on any instance.
      CLINIC_KEYS_DIR: path.join(workDir, 'keys'),
      BLOB_STORE: 's3',
      S3_BUCKET: bucket,
      S3_ENDPOINT: s3Fake.endpoint,
      S3_PREFIX: prefix,
      S3_FORCE_PATH_STYLE: 'true',
      S3_ACCESS_KEY_ID: s3Fake.credentials.accessKeyId,
      S3_SECRET_ACCESS_KEY: s3Fake.credentials.secretAccessKey,
      // Folders that must stay unused in S3 mode.
      UPLOAD_DIR: path.join(workDir, 'uploads'),
      BLOB_DIR: path.join(workDir, 'blobs'),
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(smtp.smtpPort),
      JOB_POLL_MS: '500',
    },
    path.join(workDir, 'balancer'),
  );
}, 300_000);

afterAll(async () => {
  await stopAllStarted();
  await ctx?.close();
  await database?.drop();
  await smtp?.close();
  await s3Fake?.close();
  fs.rmSync(workDir, { recursive: true, force: true });
});

async function signInThroughBalancer(email: string): Promise<string> {
  const res = await cluster.via('/api/auth/sign-in', {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: TEST_PASSWORD }),
  });
  expect(res.status).toBe(200);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

// A synthetic 10 s, 16 kHz clip: 40 Hz bursts twice a second (not a heart-sound reference).
function syntheticWav(seconds = 10, rate = 16000): Uint8Array {
  const samples = new Float32Array(seconds * rate);
  for (let i = 0; i < samples.length; i++) {
    const t = i / rate;
    samples[i] =
      t % 0.5 < 0.06 ? 0.5 * Math.sin(2 * Math.PI * 40 * t) : 0.001 * Math.sin(2 * Math.PI * 7 * t);
  }
  return encodeWav16(samples, rate);
}

const count = async (sql: string, replacements: Record<string, unknown>) => {
  const [row] = await ctx.sequelize.query<{ n: number }>(sql, { type: QueryTypes.SELECT, replacements });
  return row.n;
};

testWithBalancer(
  'when an upload is started through one instance and finished through another (S3), then the kept clip has the SHA-256 of the bytes sent and plays back',
  async () => {
    const clinic = await makeClinic('Upload across');
    const operator = await signInThroughBalancer(clinic.users.operator.email);
    const headers = {
      authorization: `Bearer ${operator}`,
      [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION),
      'tus-resumable': '1.0.0',
    };
    const keyAnswer = await cluster.via('/api/clinic/public-key', { headers });
    expect(keyAnswer.status).toBe(200);
    const wav = syntheticWav();
    const sealed = Buffer.from(
      sealClip(wav, hexToBytes(((await keyAnswer.json()) as { publicKey: string }).publicKey)),
    );
    // SHA-256 (FIPS 180-4) of exactly the bytes this test sends, by node:crypto, not by the app's own helper.
    const sentHash = createHash('sha256').update(sealed).digest('hex');

    const device = new SimDevice(cluster.publicUrl, operator);
    const clientId = await device.create('clients', clientFields('upload'));
    const sessionId = await device.create('recording_sessions', sessionFields(clientId));
    await device.create('site_recordings', siteFields(sessionId, 'mitral', sentHash));
    await device.syncUntilSettled();

    // tus 1.0 (tus.io protocol): created and half sent through the first instance ...
    const [first, second] = cluster.instances;
    const created = await fetch(`${first.url}/api/sync/uploads`, {
      method: 'POST',
      headers: {
        ...headers,
        'upload-length': String(sealed.length),
        'upload-metadata': `sha256 ${Buffer.from(sentHash).toString('base64')}`,
      },
    });
    expect(created.status).toBe(201);
    const uploadPath = new URL(created.headers.get('location')!, 'http://x').pathname;
    const half = Math.floor(sealed.length / 2);
    const patch = (base: string, offset: number, bytes: Buffer) =>
      fetch(`${base}${uploadPath}`, {
        method: 'PATCH',
        headers: {
          ...headers,
          'upload-offset': String(offset),
          'content-type': 'application/offset+octet-stream',
        },
        body: new Uint8Array(bytes),
      });
    const firstHalf = await patch(first.url, 0, sealed.subarray(0, half));
    expect(firstHalf.status).toBe(204);
    expect(firstHalf.headers.get('x-fourpoint-instance')).toBe(first.name);

    // ... and the second instance, which never saw it, knows the offset and takes the rest.
    const head = await fetch(`${second.url}${uploadPath}`, { method: 'HEAD', headers });
    expect(head.status).toBe(200);
    expect(head.headers.get('upload-offset')).toBe(String(half));
    const rest = await patch(second.url, half, sealed.subarray(half));
    expect(rest.status).toBe(204);
    expect(rest.headers.get('x-fourpoint-instance')).toBe(second.name);

    // Kept under the blob prefix in the bucket, with the hash of the bytes sent; nothing on local disk.
    const blob = await until(async () => {
      const [row] = await ctx.sequelize.query<{ storage_key: string; state: string }>(
        'SELECT storage_key, state FROM clip_blobs WHERE sha256 = :sentHash AND clinic_id = :clinicId',
        { type: QueryTypes.SELECT, replacements: { sentHash, clinicId: clinic.id } },
      );
      return row?.state === 'stored' ? row : undefined;
    });
    const object = await s3.send(
      new GetObjectCommand({ Bucket: bucket, Key: `${prefix}${blob.storage_key}` }),
    );
    const kept = Buffer.from(await object.Body!.transformToByteArray());
    expect(createHash('sha256').update(kept).digest('hex')).toBe(sentHash);
    expect(kept.equals(sealed)).toBe(true);
    const keys = ((await s3.send(new ListObjectsV2Command({ Bucket: bucket }))).Contents ?? []).map(
      (o) => o.Key,
    );
    expect(keys).toEqual([`${prefix}${blob.storage_key}`]);
    expect(fs.existsSync(path.join(workDir, 'uploads'))).toBe(false);
    expect(fs.existsSync(path.join(workDir, 'blobs'))).toBe(false);

    // Read through the balancer: the practitioner hears the WAV recorded, opened from the sealed object.
    const practitioner = await signInThroughBalancer(clinic.users.practitioner.email);
    const audio = await cluster.via(`/api/review/sessions/${sessionId}/sites/mitral/audio`, {
      headers: { authorization: `Bearer ${practitioner}` },
    });
    expect(audio.status).toBe(200);
    expect(Buffer.from(await audio.arrayBuffer()).equals(Buffer.from(wav))).toBe(true);
  },
);

testWithBalancer(
  'when a follow-up reminder falls due while three instances run the job queue, then it is mailed once',
  async () => {
    const clinic = await makeClinic('Reminder once');
    const operator = await signInThroughBalancer(clinic.users.operator.email);
    const email = `reminded.${randomUUID().slice(0, 8)}@test.fourpoint.test`;
    // Due: tomorrow is within the default notice of three days (follow-ups-repository.ts, queueReminders).
    const tomorrow = new Date(Date.now() + 24 * 3600 * 1000).toISOString().slice(0, 10);
    const device = new SimDevice(cluster.publicUrl, operator);
    const clientId = await device.create('clients', { ...clientFields('reminder'), email });
    const sessionId = await device.create('recording_sessions', sessionFields(clientId));
    await device.syncUntilSettled();
    // The practitioner sets the follow-up (an operator cannot), through the balancer.
    const practitioner = {
      authorization: `Bearer ${await signInThroughBalancer(clinic.users.practitioner.email)}`,
      'content-type': 'application/json',
    };
    const detail = await cluster.via(`/api/review/sessions/${sessionId}`, { headers: practitioner });
    expect(detail.status).toBe(200);
    const { notes } = (await detail.json()) as { notes: { version: number } };
    const saved = await cluster.via(`/api/review/sessions/${sessionId}/notes`, {
      method: 'PUT',
      headers: practitioner,
      body: JSON.stringify({
        findings: null,
        plan: null,
        followUpDate: tomorrow,
        baseVersion: notes.version,
      }),
    });
    expect(saved.status).toBe(200);

    // The reminder job is asked for as its schedule would, once for each instance, and each run is let finish
    // before the next is asked for: every instance polls the queue, so the runs land wherever they land.
    const boss = new PgBoss({
      connectionString: database.url,
      schema: 'pgboss',
      max: 1,
      supervise: false,
      schedule: false,
    });
    await boss.start();
    try {
      for (let round = 0; round < 3; round++) {
        await until(async () => (await boss.send('follow-up-reminders', {})) ?? undefined);
        await until(async () =>
          (await count(
            `SELECT count(*)::int AS n FROM pgboss.job
              WHERE name = 'follow-up-reminders' AND state IN ('created', 'retry', 'active')`,
            {},
          )) === 0
            ? true
            : undefined,
        );
      }
    } finally {
      await boss.stop({ graceful: false, wait: true });
    }
    const toClient = smtp.messages.filter((m) => m.envelopeTo.includes(email));
    expect(toClient).toHaveLength(1);
    expect(toClient[0].subject).toBe(`Your follow-up visit at ${clinic.name}`);
    expect(
      await count(
        `SELECT count(*)::int AS n FROM follow_up_reminders WHERE client_id = :clientId AND status = 'sent'`,
        {
          clientId,
        },
      ),
    ).toBe(1);
  },
);

// Last in this file: it leaves two instances running.
testWithBalancer(
  'when an instance is killed in the middle of a push and the device retries through the others, then nothing is lost or doubled',
  async () => {
    const clinic = await makeClinic('Killed mid-push');
    const operator = await signInThroughBalancer(clinic.users.operator.email);
    const device = new SimDevice(cluster.publicUrl, operator);
    const clientId = await device.create('clients', clientFields('killed'));
    const sessionId = await device.create('recording_sessions', sessionFields(clientId));
    for (const site of SITES)
      await device.create(
        'site_recordings',
        siteFields(sessionId, site, randomUUID().replace(/-/g, '').repeat(2)),
      );

    // Hold the push half-way: a lock that lets it start its work but not write the site recordings.
    const holder = new pg.Client({ connectionString: database.url });
    await holder.connect();
    let pushing: Promise<SyncReport> | undefined;
    let killed: string | undefined;
    try {
      await holder.query('BEGIN');
      await holder.query('LOCK TABLE site_recordings IN SHARE MODE');
      pushing = device.sync();
      // Each instance names its connections (`fourpoint <instance>`): the one waiting on the lock is serving the push.
      killed = await until(async () => {
        const { rows } = await holder.query<{ application_name: string }>(
          `SELECT application_name FROM pg_stat_activity
            WHERE datname = current_database() AND wait_event_type = 'Lock' AND application_name LIKE 'fourpoint %'`,
        );
        return rows[0]?.application_name.slice('fourpoint '.length);
      }, 50);
      const victim = cluster.instances.find((i) => i.name === killed)!;
      const gone = new Promise((resolve) => victim.child.once('exit', resolve));
      victim.child.kill('SIGKILL');
      await gone;
    } finally {
      await holder.query('COMMIT');
      await holder.end();
    }
    // The push in flight did not come back applied: its instance died under it, and HAProxy never sends a
    // request that reached an instance to another one (balancer.mjs), so nothing was sent twice behind its back.
    const interrupted = await pushing!;
    expect(interrupted.sent).toBe(0);

    // The device retries (its own backoff) through the balancer, which now sends it to the others.
    await device.syncUntilSettled();
    const outbox = await device.storage.listOutbox();
    expect(outbox.map((item) => item.state)).toEqual(Array(6).fill('sent'));

    expect(await count('SELECT count(*)::int AS n FROM clients WHERE id = :clientId', { clientId })).toBe(1);
    expect(
      await count('SELECT count(*)::int AS n FROM recording_sessions WHERE id = :sessionId', { sessionId }),
    ).toBe(1);
    expect(
      await count('SELECT count(*)::int AS n FROM site_recordings WHERE session_id = :sessionId', {
        sessionId,
      }),
    ).toBe(4);
    expect(
      await count(
        `SELECT count(DISTINCT site)::int AS n FROM site_recordings WHERE session_id = :sessionId`,
        { sessionId },
      ),
    ).toBe(4);
    expect(
      await count('SELECT count(*)::int AS n FROM applied_mutations WHERE clinic_id = :clinicId', {
        clinicId: clinic.id,
      }),
    ).toBe(6);
  },
);
