// Server processes as `INSTANCES=N npm start` runs them (sync-server/src/main.ts) behind the real load balancer
// (Debian's HAProxy, configured by scripts/bootstrap/balancer.mjs), on a database of their own in the test
// cluster. Their own database because each instance runs the job queue: reminders, report-mail retries and the
// purge work over every clinic in their database, and must not take up rows other test files are working on.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import net from 'node:net';
import path from 'node:path';
import readline from 'node:readline';
import pg from 'pg';
import { runMigrations } from '@/sync-server/src/db/migrator';
import { databaseUrl } from './test-app';

const ROOT = path.join(__dirname, '../../..');
const BALANCER = path.join(ROOT, 'scripts/bootstrap/balancer.mjs');

export const haproxyMissing = spawnSync(process.execPath, [BALANCER, '--find']).status !== 0;
if (haproxyMissing)
  console.warn('skipped: HAProxy is not installed (sudo apt-get install -y haproxy; npm test installs it)');

export const freePort = () =>
  new Promise<number>((resolve) => {
    const probe = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });

export const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Polls `check` until it returns a value other than undefined (bounded by the test's timeout). */
export async function until<T>(check: () => Promise<T | undefined>, everyMs = 200): Promise<T> {
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    await pause(everyMs);
  }
}

/** A fresh database in the test cluster, migrated; `drop` removes it (and ends its connections). */
export async function isolatedDatabase(): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `fourpoint_lb_${randomBytes(6).toString('hex')}`;
  const admin = async (sql: string) => {
    const client = new pg.Client({ connectionString: databaseUrl() });
    await client.connect();
    try {
      await client.query(sql);
    } finally {
      await client.end();
    }
  };
  await admin(`CREATE DATABASE ${name}`);
  const url = new URL(databaseUrl());
  url.pathname = `/${name}`;
  await runMigrations(url.toString());
  return { url: url.toString(), drop: () => admin(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`) };
}

// Every process started here, so a test file's afterAll stops them even when its beforeAll timed out half-way;
// one started after that is stopped at once.
const running = new Map<ChildProcess, NodeJS.Signals>();
let stoppingAll = false;

function track(child: ChildProcess, stopSignal: NodeJS.Signals): void {
  running.set(child, stopSignal);
  child.once('exit', () => running.delete(child));
  if (stoppingAll) child.kill(stopSignal);
}

/** Stops every instance and balancer this file started; resolves once they have exited. */
export async function stopAllStarted(): Promise<void> {
  stoppingAll = true;
  await Promise.all(
    [...running].map(([child, stopSignal]) => {
      const exited = new Promise((resolve) => child.once('exit', resolve));
      child.kill(stopSignal);
      return exited;
    }),
  );
}

export interface ServerInstance {
  name: string;
  port: number;
  url: string;
  child: ChildProcess;
}

export interface BalancedInstances {
  publicUrl: string;
  instances: ServerInstance[];
  /** A request through the balancer. */
  via: (requestPath: string, init?: RequestInit) => Promise<Response>;
  close: () => Promise<void>;
}

/** One server process as npm start runs it, waiting for its "running" line. */
async function startInstance(name: string, env: Record<string, string>): Promise<ServerInstance> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'sync-server/src/main.ts')], {
    cwd: ROOT,
    env: {
      ...process.env,
      ...env,
      PORT: String(port),
      FOURPOINT_INSTANCE: name,
      TRUST_PROXY: 'loopback',
      LOG_LEVEL: 'warn',
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  track(child, 'SIGKILL');
  await new Promise<void>((resolve, reject) => {
    readline.createInterface({ input: child.stdout! }).on('line', (line) => {
      if (line.startsWith('Fourpoint is running')) resolve();
    });
    child.once('exit', (code) => reject(new Error(`instance ${name} exited (${code}) before listening`)));
  });
  return { name, port, url: `http://127.0.0.1:${port}`, child };
}

/**
 * Starts `names.length` instances with `env` (DATABASE_URL, JWT_SECRET and whatever the test needs) and the
 * balancer in front of them; resolves once answers through the balancer have come from every instance.
 */
export async function startBalancedInstances(
  names: string[],
  env: Record<string, string>,
  balancerDir: string,
): Promise<BalancedInstances> {
  const instances = await Promise.all(names.map((name) => startInstance(name, env)));
  const publicPort = await freePort();
  const balancer = spawn(
    process.execPath,
    [BALANCER, balancerDir, String(publicPort), ...instances.map((i) => `${i.name}:${i.port}`)],
    { stdio: 'inherit' },
  );
  // The balancer script passes SIGTERM on to HAProxy.
  track(balancer, 'SIGTERM');
  const publicUrl = `http://127.0.0.1:${publicPort}`;
  const via = (requestPath: string, init?: RequestInit) => fetch(`${publicUrl}${requestPath}`, init);
  await until(async () => {
    const seen = new Set<string>();
    for (let i = 0; i < 2 * names.length; i++) {
      const res = await via('/api/health/ready').catch(() => null);
      const name = res?.headers.get('x-fourpoint-instance');
      if (name) seen.add(name);
    }
    return seen.size === names.length ? true : undefined;
  });
  return { publicUrl, instances, via, close: stopAllStarted };
}
