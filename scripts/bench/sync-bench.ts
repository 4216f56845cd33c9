// Sync push benchmark: a finished four-site session as the phone pushes it (client, consent, session, four site
// recordings: seven mutations in one push) from 1, 8 and 32 concurrent simulated devices over loopback HTTP,
// beside the raw PostgreSQL writes of the same seven rows at the same concurrency, in the same run. Targets at
// every concurrency: sessions/s >= 50 % of raw, and p95 <= 2x the raw p95. Then the same 32-device push through
// HAProxy (scripts/bootstrap/balancer.mjs) in front of 1 and 3 server processes, beside the same push sent to one
// such process directly: on a machine of two cores this measures the cost of the extra hop, not a speed-up.
//
// The devices run in a process of their own (this file with --load), as they would on their own phones, so the
// server's process spends its time on the server's work. BENCH_SPANS=1 adds where a push's time goes on the
// server (database round trips, waits for a pooled connection, the rest), from timing spans around each query.
import { spawn, type ChildProcess } from 'node:child_process';
import { AsyncLocalStorage } from 'node:async_hooks';
import { randomUUID } from 'node:crypto';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import pino from 'pino';
import axios from 'axios';
import { QueryTypes, type Sequelize } from 'sequelize';
import { composeServices } from '@/sync-server/src/composition-root';
import { loadConfig } from '@/sync-server/src/config/settings';
import { createApp } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { runMigrations } from '@/sync-server/src/db/migrator';
import { createClinic } from '@/sync-server/src/repositories/clinics-repository';
import { selectRows } from '@/sync-server/src/repositories/sql';
import { createUser } from '@/sync-server/src/repositories/users-repository';
import { hashPassword } from '@/sync-server/src/services/passwords';
import {
  figures,
  rawSessions,
  runLoad,
  type Figures,
  type LoadJob,
  type LoadResult,
} from './sync-push-workload';

const ROUNDS_PER_DEVICE = Number(process.env.BENCH_ROUNDS ?? 10);
// A p95 of ten samples is their slowest one: every row has at least 40 sessions, so one stall does not decide it.
const roundsAt = (devices: number) => Math.max(ROUNDS_PER_DEVICE, Math.ceil(40 / devices));
/** BENCH_SYNC_PART=balancer runs only the rows through the load balancer. */
const BALANCER_ONLY = process.env.BENCH_SYNC_PART === 'balancer';
const JWT_SECRET = randomUUID();
const root = path.resolve(__dirname, '../..');

/** Runs this script again in a child process with `args`; resolves with its stdout once it exits. */
function runChild(args: string[]): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [...process.execArgv, __filename, ...args], {
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.on('error', reject);
    child.on('exit', (code) => (code === 0 ? resolve(out) : reject(new Error(`${args[0]} exited ${code}`))));
  });
}

const loadFromOtherProcess = async (job: LoadJob): Promise<LoadResult> =>
  JSON.parse(await runChild(['--load', JSON.stringify(job)])) as LoadResult;

/** A server process of its own (this file with --serve): the app as `npm start` runs it, named `name`. */
function startInstance(databaseUrl: string, name: string): Promise<{ port: number; child: ChildProcess }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [...process.execArgv, __filename, '--serve', name], {
      stdio: ['ignore', 'pipe', 'inherit'],
      env: { ...process.env, DATABASE_URL: databaseUrl, BENCH_JWT_SECRET: JWT_SECRET },
    });
    child.stdout.once('data', (c: Buffer) => resolve({ port: Number(c.toString().trim()), child }));
    child.on('error', reject);
    child.on('exit', (code) => code !== 0 && code !== null && reject(new Error(`instance exited ${code}`)));
  });
}

async function serve(name: string): Promise<void> {
  const sequelize = createSequelize(process.env.DATABASE_URL!, { poolMax: 20 });
  const app = createApp({
    sequelize,
    jwtSecret: process.env.BENCH_JWT_SECRET!,
    services: composeServices(loadConfig(), sequelize),
    logger: pino({ level: 'silent' }),
    instanceName: name,
    trustProxy: 'loopback',
  });
  const server = http.createServer(app);
  server.listen(0, '127.0.0.1', () => process.stdout.write(`${(server.address() as AddressInfo).port}\n`));
  process.on('SIGTERM', () => {
    server.closeAllConnections();
    server.close(() => sequelize.close().finally(() => process.exit(0)));
  });
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as AddressInfo;
      probe.close(() => resolve(port));
    });
  });
}

async function waitForPort(port: number): Promise<void> {
  for (let i = 0; i < 100; i++) {
    try {
      const res = await axios.get(`http://127.0.0.1:${port}/api/health/live`, { timeout: 1000 });
      if (res.status === 200) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`nothing answers on port ${port}`);
}

type Query = (...args: unknown[]) => unknown;
/** Waits until answers through the balancer on `port` have come from `count` different instances. */
async function untilServedByAll(port: number, count: number): Promise<void> {
  for (let round = 0; round < 300; round++) {
    const seen = new Set<string>();
    for (let i = 0; i < 2 * count; i++) {
      const res = await axios
        .get(`http://127.0.0.1:${port}/api/health/live`, { timeout: 5000, validateStatus: () => true })
        .catch(() => null);
      const name = res?.headers['x-fourpoint-instance'];
      if (typeof name === 'string') seen.add(name);
    }
    if (seen.size >= count) return;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`the balancer on port ${port} never served from ${count} instances`);
}

/**
 * Timing spans on the server: each request's time from arrival to the end of its answer, and inside it every
 * query (by kind) and every wait for a pooled connection. What is left is Node's own work plus the wait for a
 * core on this shared machine.
 */
class Spans {
  private readonly current = new AsyncLocalStorage<Record<string, number>>();
  private readonly requests: Record<string, number>[] = [];

  instrument(sequelize: Sequelize): void {
    // At the pg client, under Sequelize: the batch statement is sent there directly (a named prepared statement),
    // and every call is one round trip.
    const manager = (sequelize as unknown as { connectionManager: { getConnection: Query } })
      .connectionManager;
    const getConnection = manager.getConnection.bind(manager);
    const timed = new WeakSet<object>();
    manager.getConnection = async (...args: unknown[]) => {
      const t0 = performance.now();
      try {
        const connection = (await getConnection(...args)) as { query: Query };
        if (!timed.has(connection)) {
          timed.add(connection);
          connection.query = this.timedQuery(connection.query.bind(connection));
        }
        return connection;
      } finally {
        const span = this.current.getStore();
        if (span) span['pool wait'] = (span['pool wait'] ?? 0) + performance.now() - t0;
      }
    };
  }

  /** pg's query, callback or promise style, adding its time to the request's span by kind. */
  private timedQuery(query: Query): Query {
    return (...args: unknown[]) => {
      const span = this.current.getStore();
      const t0 = performance.now();
      const first = args[0] as string | { text: string };
      const done = () => {
        if (!span) return;
        const kind = `db ${Spans.kind(typeof first === 'string' ? first : first.text)}`;
        span[kind] = (span[kind] ?? 0) + performance.now() - t0;
        span.trips = (span.trips ?? 0) + 1;
      };
      const last = args.length - 1;
      const callback = args[last];
      if (typeof callback === 'function') {
        args[last] = (...results: unknown[]) => {
          done();
          (callback as (...r: unknown[]) => void)(...results);
        };
        return query(...args);
      }
      return (query(...args) as Promise<unknown>).finally(done);
    };
  }

  private static kind(sql: string): string {
    if (/sign_in_sessions/.test(sql)) return 'sign-in check';
    if (/^(START TRANSACTION|BEGIN|SET )/i.test(sql)) return 'begin';
    if (/^WITH batch/.test(sql)) return 'batch statement';
    if (/^COMMIT/i.test(sql)) return 'commit';
    if (/^ROLLBACK|SAVEPOINT/i.test(sql)) return 'rollback/savepoint';
    return 'push statements';
  }

  handler(app: http.RequestListener): http.RequestListener {
    return (req, res) => {
      const span: Record<string, number> = {};
      const t0 = performance.now();
      res.on('finish', () => {
        span.total = performance.now() - t0;
        if (req.url === '/api/sync/push') this.requests.push(span);
      });
      this.current.run(span, () => app(req, res));
    };
  }

  /** Mean ms per push of each part since the last call. */
  report(): string {
    const n = this.requests.length;
    const sums: Record<string, number> = {};
    for (const span of this.requests.splice(0))
      for (const [key, value] of Object.entries(span)) sums[key] = (sums[key] ?? 0) + value;
    const db = Object.entries(sums).filter(([k]) => k.startsWith('db '));
    const accounted = db.reduce((s, [, v]) => s + v, 0) + (sums['pool wait'] ?? 0);
    const parts = [
      ...db.map(([k, v]) => `${k.slice(3)} ${(v / n).toFixed(1)}`),
      `pool wait ${((sums['pool wait'] ?? 0) / n).toFixed(1)}`,
      `node + CPU wait ${((sums.total - accounted) / n).toFixed(1)}`,
    ];
    return `  server time per push ${(sums.total / n).toFixed(1)} ms (${((sums.trips ?? 0) / n).toFixed(1)} round trips): ${parts.join(', ')}`;
  }
}

const ms = (v: number) => v.toFixed(1).padStart(6);
const pctText = (v: number) => `${(v * 100).toFixed(0)} %`;

async function main(): Promise<void> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl)
    throw new Error('DATABASE_URL is not set: run through `npm run bench`, which starts a database.');
  await runMigrations(databaseUrl);
  const sequelize = createSequelize(databaseUrl, { poolMax: 20 });
  const spans = process.env.BENCH_SPANS ? new Spans() : undefined;
  spans?.instrument(sequelize);
  const app = createApp({
    sequelize,
    jwtSecret: JWT_SECRET,
    services: composeServices(loadConfig(), sequelize),
    logger: pino({ level: 'silent' }),
  });
  const server = http.createServer(spans ? spans.handler(app) : app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const clinic = { id: randomUUID(), name: `Bench ${randomUUID().slice(0, 6)}` };
  await createClinic(sequelize, clinic);
  const email = `bench.${randomUUID().slice(0, 8)}@bench.fourpoint.test`;
  const operatorId = randomUUID();
  await createUser(sequelize, clinic.id, {
    id: operatorId,
    email,
    name: 'Bench Operator',
    role: 'operator',
    passwordHash: await hashPassword('bench password 1'),
  });
  // The wording a new clinic starts with (clinics-repository).
  const [{ id: consentTextId }] = await selectRows<{ id: string }>(
    sequelize,
    `SELECT id FROM consent_texts WHERE clinic_id = :clinicId AND is_current`,
    { clinicId: clinic.id },
  );
  const token = (await axios.post(`${url}/api/auth/sign-in`, { email, password: 'bench password 1' })).data
    .accessToken as string;
  const ids = { clinicId: clinic.id, consentTextId, operatorId };

  const job = (target: string, devices: number, kind: LoadJob['kind']): LoadJob => ({
    url: target,
    token,
    consentTextId,
    devices,
    rounds: roundsAt(devices),
    kind,
  });
  async function pushes(target: string, devices: number): Promise<Figures & { instances: string }> {
    const result = await loadFromOtherProcess(job(target, devices, 'push'));
    if (result.notApplied > 0) throw new Error(`${result.notApplied} bench pushes were not applied`);
    const spread = Object.entries(result.instances)
      .map(([name, n]) => `${name} ${n}`)
      .join(', ');
    return { ...figures(result.latencies, result.seconds), instances: spread };
  }

  // Warm-up at the largest concurrency, for both sides: every pooled connection is open (a new one costs a
  // password exchange and cold catalog caches) and has run the batch statement more than five times, after which
  // PostgreSQL keeps its generic plan. With a smaller warm-up the push met cold connections that the raw writes,
  // measured after it, then found warm.
  await pushes(url, 32);
  if (BALANCER_ONLY) {
    await throughBalancer(databaseUrl, (target) => pushes(target, 32));
    server.close();
    await sequelize.close();
    return;
  }
  await rawSessions(sequelize, ids, 32, ROUNDS_PER_DEVICE);
  spans?.report();
  console.log(
    `sync push of a finished four-site session (7 mutations: client, consent, session, 4 sites), ` +
      `${ROUNDS_PER_DEVICE} sessions per device (at least 40 a row), loopback, ${os.cpus().length} cores`,
  );
  console.log(
    'devices | push p50 | push p95 | sessions/s | raw p50 | raw p95 | raw sessions/s | rate vs raw | p95 vs raw',
  );
  const verdicts: string[] = [];
  let direct32: Figures | undefined;
  for (const devices of [1, 8, 32]) {
    const push = await pushes(url, devices);
    const spanLine = spans?.report();
    const raw = await rawSessions(sequelize, ids, devices, roundsAt(devices));
    const rate = push.rate / raw.rate;
    const p95 = push.p95 / raw.p95;
    console.log(
      `${String(devices).padStart(7)} | ${ms(push.p50)}   | ${ms(push.p95)}   | ${push.rate.toFixed(1).padStart(10)} | ${ms(raw.p50)}  | ${ms(raw.p95)}  | ${raw.rate.toFixed(1).padStart(14)} | ${pctText(rate).padStart(11)} | ${p95.toFixed(2).padStart(9)}x`,
    );
    if (spanLine) console.log(spanLine);
    if (devices === 32) direct32 = push;
    const met = rate >= 0.5 && p95 <= 2;
    verdicts.push(`${devices}: ${met ? 'met' : 'NOT met'}`);
  }
  console.log(`targets (sessions/s >= 50 % of raw, p95 <= 2x raw p95) at ${verdicts.join('; ')}`);

  const health = await loadFromOtherProcess(job(url, 32, 'health'));
  const pull = await loadFromOtherProcess(job(url, 32, 'pull'));
  console.log(
    `HTTP floor at 32 devices: GET /api/health ${figures(health.latencies, health.seconds).rate.toFixed(1)} req/s, ` +
      `empty authenticated pull ${figures(pull.latencies, pull.seconds).rate.toFixed(1)} req/s`,
  );

  // BENCH_BALANCER=0 measures the push alone (the balancer rows start three more processes and take minutes).
  if (process.env.BENCH_BALANCER !== '0')
    await throughBalancer(databaseUrl, (target) => pushes(target, 32), direct32!);

  const [{ count }] = await sequelize.query<{ count: string }>(
    `SELECT count(*) FROM applied_mutations WHERE clinic_id = :clinicId`,
    { replacements: { clinicId: clinic.id }, type: QueryTypes.SELECT },
  );
  console.log(`${count} mutations recorded`);
  server.close();
  await sequelize.close();
}

/**
 * The 32-device push through HAProxy in front of 1 and 3 server processes, beside the same push sent straight to
 * one such process. All of them share this machine's cores with PostgreSQL and the devices, so more instances
 * cannot add capacity here; what the figures show is what the balancer's hop adds to each push.
 */
async function throughBalancer(
  databaseUrl: string,
  push32: (target: string) => Promise<Figures & { instances: string }>,
  inProcess?: Figures,
): Promise<void> {
  const balancerScript = path.join(root, 'scripts/bootstrap/balancer.mjs');
  const haproxy = spawn(process.execPath, [balancerScript, '--find']);
  const found = await new Promise<boolean>((r) => haproxy.on('exit', (code) => r(code === 0)));
  if (!found) {
    console.log('load balancer: HAProxy is not installed (sudo apt-get install -y haproxy); skipped');
    return;
  }
  console.log(
    `through the load balancer, 32 devices (the cost of the extra hop on ${os.cpus().length} shared cores, not a speed-up; ` +
      `load average ${os.loadavg()[0].toFixed(1)}):`,
  );
  console.log('path                         |    p50 |    p95 | sessions/s | requests per instance');
  const row = (label: string, f: Figures, spread = '') =>
    console.log(
      `${label.padEnd(28)} | ${ms(f.p50)} | ${ms(f.p95)} | ${f.rate.toFixed(1).padStart(10)} | ${spread}`,
    );
  if (inProcess) row('in the bench process', inProcess);

  const instances = await Promise.all([1, 2, 3].map((i) => startInstance(databaseUrl, `i${i}`)));
  try {
    for (const { port } of instances) await waitForPort(port);
    const direct = await push32(`http://127.0.0.1:${instances[0].port}`);
    row('one instance, no balancer', direct, direct.instances);
    for (const count of [1, 3]) {
      const publicPort = await freePort();
      const dir = path.join(root, '.data', `bench-balancer-${count}`);
      const backends = instances.slice(0, count).map((s, i) => `i${i + 1}:${s.port}`);
      const balancer = spawn(process.execPath, [balancerScript, dir, String(publicPort), ...backends], {
        stdio: ['ignore', 'ignore', 'inherit'],
      });
      try {
        await waitForPort(publicPort);
        // Every instance must have passed its readiness check, or the first requests all land on one.
        await untilServedByAll(publicPort, count);
        const result = await push32(`http://127.0.0.1:${publicPort}`).catch((error: Error) => error);
        if (result instanceof Error) {
          // An instance taken out by its readiness check (balancer.mjs) leaves the devices with 503s.
          console.log(`HAProxy, ${count} instance(s): not measured, ${result.message.split('\n')[0]}`);
          continue;
        }
        row(`HAProxy, ${count} instance${count > 1 ? 's' : ''}`, result, result.instances);
        console.log(
          `  extra hop: p50 ${(result.p50 - direct.p50).toFixed(1)} ms, p95 ${(result.p95 - direct.p95).toFixed(1)} ms, ` +
            `sessions/s ${pctText(result.rate / direct.rate)} of one instance without the balancer`,
        );
      } finally {
        balancer.kill('SIGTERM');
        await new Promise((r) => balancer.once('exit', r));
      }
    }
  } finally {
    for (const { child } of instances) child.kill('SIGTERM');
  }
}

if (process.argv[2] === '--load') {
  runLoad(JSON.parse(process.argv[3]) as LoadJob)
    .then((result) => process.stdout.write(JSON.stringify(result)))
    .catch((error) => {
      console.error(error);
      process.exit(1);
    });
} else if (process.argv[2] === '--serve') {
  serve(process.argv[3]).catch((error) => {
    console.error(error);
    process.exit(1);
  });
} else {
  main().catch((error) => {
    console.error(error);
    process.exit(1);
  });
}
