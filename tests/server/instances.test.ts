// Several server instances behind the real load balancer (Debian's HAProxy, configured by
// scripts/bootstrap/balancer.mjs as `INSTANCES=3 npm start` does), on one PostgreSQL: answers come from more than one
// instance, the sign-in limit counts over all of them, and a stopping instance finishes the request in flight
// (tests/server/helpers/balanced-instances.ts; the same in S3 mode, killed and with jobs: instances-s3.test.ts).
// Without HAProxy the file says so in one line and skips (npm test's set-up installs it).
import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import {
  haproxyMissing,
  isolatedDatabase,
  startBalancedInstances,
  stopAllStarted,
  type BalancedInstances,
} from './helpers/balanced-instances';
import { makeClinic, makeTestContext, TEST_PASSWORD, type TestContext } from './helpers/test-app';

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-instances-'));
let database: Awaited<ReturnType<typeof isolatedDatabase>>;
let cluster: BalancedInstances;
let ctx: TestContext;
const testWithBalancer = haproxyMissing ? test.skip : test;

beforeAll(async () => {
  if (haproxyMissing) return;
  database = await isolatedDatabase();
  ctx = makeTestContext({}, { databaseUrl: database.url });
  cluster = await startBalancedInstances(
    ['i1', 'i2', 'i3'],
    {
      DATABASE_URL: database.url,
      JWT_SECRET: ctx.jwtSecret,
      BLOB_DIR: path.join(dataDir, 'blobs'),
      UPLOAD_DIR: path.join(dataDir, 'uploads'),
    },
    path.join(dataDir, 'balancer'),
  );
}, 300_000);

afterAll(async () => {
  await stopAllStarted();
  await ctx?.close();
  await database?.drop();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

const viaBalancer = (p: string, init?: RequestInit) => cluster.via(p, init);

testWithBalancer(
  'when requests go through the balancer, then answers come from more than one instance, each naming itself',
  async () => {
    const names = new Set<string>();
    for (let i = 0; i < 6; i++) {
      const res = await viaBalancer('/api/health/live');
      expect(res.status).toBe(200);
      names.add(res.headers.get('x-fourpoint-instance') ?? 'none');
    }
    expect([...names].sort()).toEqual(['i1', 'i2', 'i3']);
  },
);

// OWASP ASVS 4.0.3 V2.2.1: anti-automation against credential stuffing; the limit must hold however requests are
// spread over the instances, which share it in PostgreSQL.
testWithBalancer(
  'when ten wrong passwords are spread over the instances, then the next sign-in is refused for too many attempts',
  async () => {
    const clinic = await makeClinic('Instances');
    const email = clinic.users.operator.email;
    const signIn = (password: string) =>
      viaBalancer('/api/auth/sign-in', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email, password }),
      });
    const servedBy = new Set<string>();
    for (let i = 0; i < 10; i++) {
      const res = await signIn(`wrong password ${i}`);
      expect(res.status).toBe(401);
      servedBy.add(res.headers.get('x-fourpoint-instance') ?? 'none');
    }
    expect(servedBy.size).toBe(3);
    const blocked = await signIn(TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(((await blocked.json()) as { error: { code: string } }).error.code).toBe('too_many_attempts');
  },
);

testWithBalancer(
  'when an instance is sent SIGTERM mid-request, then it stops listening, finishes that request and exits',
  async () => {
    const clinic = await makeClinic('Draining');
    const signedIn = await viaBalancer('/api/auth/sign-in', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: clinic.users.operator.email, password: TEST_PASSWORD }),
    });
    const { accessToken } = (await signedIn.json()) as { accessToken: string };
    const target = cluster.instances[2];
    const size = 64 * 1024;
    const sha256 = 'ab'.repeat(32);
    // tus 1.0: create the upload, then send its bytes in one PATCH that pauses half-way.
    const created = await fetch(`http://127.0.0.1:${target.port}/api/sync/uploads`, {
      method: 'POST',
      headers: {
        authorization: `Bearer ${accessToken}`,
        [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION),
        'tus-resumable': '1.0.0',
        // Twice what the PATCH below sends: the upload stays incomplete, so its answer is tus's plain 204.
        'upload-length': String(2 * size),
        'upload-metadata': `sha256 ${Buffer.from(sha256).toString('base64')}`,
      },
    });
    expect(created.status).toBe(201);
    const uploadPath = new URL(created.headers.get('location')!, 'http://x').pathname;

    const exited = new Promise<number | null>((resolve) =>
      target.child.once('exit', (code) => resolve(code)),
    );
    const answer = new Promise<http.IncomingMessage>((resolve, reject) => {
      const req = http.request({
        host: '127.0.0.1',
        port: target.port,
        path: uploadPath,
        method: 'PATCH',
        headers: {
          authorization: `Bearer ${accessToken}`,
          [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION),
          'tus-resumable': '1.0.0',
          'upload-offset': '0',
          'content-type': 'application/offset+octet-stream',
          'content-length': String(size),
        },
      });
      req.on('response', resolve).on('error', reject);
      req.write(Buffer.alloc(size / 2, 1));
      const stagedFile = path.join(dataDir, 'uploads', path.basename(uploadPath));
      void (async () => {
        // Half the bytes have reached the instance (its staged file grows): now stop it, and send the rest once it
        // no longer takes connections.
        while (!fs.existsSync(stagedFile) || fs.statSync(stagedFile).size === 0)
          await new Promise((resolve) => setTimeout(resolve, 20));
        target.child.kill('SIGTERM');
        for (;;) {
          const refused = await new Promise<boolean>((resolve) => {
            const socket = net.connect(target.port, '127.0.0.1');
            socket.once('connect', () => (socket.destroy(), resolve(false)));
            socket.once('error', () => resolve(true));
          });
          if (refused) break;
          await new Promise((resolve) => setTimeout(resolve, 50));
        }
        req.end(Buffer.alloc(size / 2, 2));
      })();
    });
    const res = await answer;
    res.resume();
    // The in-flight PATCH was finished: every byte is in (tus answers 204 with the new offset).
    expect(res.statusCode).toBe(204);
    expect(res.headers['upload-offset']).toBe(String(size));
    expect(await exited).toBe(0);
    // The balancer keeps serving from the others.
    const after = await viaBalancer('/api/health/live');
    expect(after.status).toBe(200);
    // Instances join the list as they come up, so the stopped one is any of the three: the answer names another.
    const others = cluster.instances.filter((i) => i !== target).map((i) => i.name);
    expect(others).toContain(after.headers.get('x-fourpoint-instance'));
  },
);
