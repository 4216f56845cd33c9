// Several server instances behind the real load balancer (Debian's HAProxy, configured by
// scripts/bootstrap/balancer.mjs as `INSTANCES=3 npm start` does), on one PostgreSQL: answers come from more than one
// instance, the sign-in limit counts over all of them, and a stopping instance finishes the request in flight.
// Without HAProxy the file says so in one line and skips (npm test's set-up installs it).
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import readline from 'node:readline';
import { SYNC_PROTOCOL_HEADER, SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import { makeClinic, makeTestContext, TEST_PASSWORD, type TestContext } from './helpers/test-app';

const ROOT = path.join(__dirname, '../..');
const BALANCER = path.join(ROOT, 'scripts/bootstrap/balancer.mjs');

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-instances-'));
const instances: { name: string; port: number; child: ChildProcess }[] = [];
let balancer: ChildProcess | null = null;
let publicPort = 0;
let ctx: TestContext;
const haproxyMissing = spawnSync(process.execPath, [BALANCER, '--find']).status !== 0;
if (haproxyMissing)
  console.warn('skipped: HAProxy is not installed (sudo apt-get install -y haproxy; npm test installs it)');
const testWithBalancer = haproxyMissing ? test.skip : test;

const freePort = () =>
  new Promise<number>((resolve) => {
    const probe = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });

/** One server process as npm start runs it (main.ts), waiting for its "running" line. */
async function startInstance(name: string) {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'sync-server/src/main.ts')], {
    cwd: ROOT,
    env: {
      ...process.env,
      PORT: String(port),
      FOURPOINT_INSTANCE: name,
      TRUST_PROXY: 'loopback',
      JWT_SECRET: ctx.jwtSecret,
      BLOB_DIR: path.join(dataDir, 'blobs'),
      UPLOAD_DIR: path.join(dataDir, 'uploads'),
      LOG_LEVEL: 'warn',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  await new Promise<void>((resolve, reject) => {
    readline.createInterface({ input: child.stdout! }).on('line', (line) => {
      if (line.startsWith('Fourpoint is running')) resolve();
    });
    child.once('exit', (code) => reject(new Error(`instance ${name} exited (${code}) before listening`)));
  });
  instances.push({ name, port, child });
}

beforeAll(async () => {
  if (haproxyMissing) return;
  ctx = makeTestContext();
  await Promise.all(['i1', 'i2', 'i3'].map(startInstance));
  publicPort = await freePort();
  balancer = spawn(
    process.execPath,
    [
      BALANCER,
      path.join(dataDir, 'balancer'),
      String(publicPort),
      ...instances.map((i) => `${i.name}:${i.port}`),
    ],
    { stdio: 'inherit' },
  );
  // Ready once the balancer has seen every instance answer its readiness check.
  for (;;) {
    const seen = new Set<string>();
    for (let i = 0; i < 6; i++) {
      const res = await fetch(`http://127.0.0.1:${publicPort}/api/health/ready`).catch(() => null);
      const name = res?.headers.get('x-fourpoint-instance');
      if (name) seen.add(name);
    }
    if (seen.size === 3) break;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
}, 120_000);

afterAll(async () => {
  balancer?.kill('SIGTERM');
  for (const { child } of instances) if (child.exitCode === null) child.kill('SIGKILL');
  await ctx?.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

const viaBalancer = (p: string, init?: RequestInit) => fetch(`http://127.0.0.1:${publicPort}${p}`, init);

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
    const target = instances[2];
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
    const others = instances.filter((i) => i !== target).map((i) => i.name);
    expect(others).toContain(after.headers.get('x-fourpoint-instance'));
  },
);
