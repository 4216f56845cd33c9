// Sync push benchmark: a four-site session (client, session, four site recordings: six mutations in one push)
// from 1, 8 and 32 concurrent simulated devices over loopback HTTP, beside the raw insert rate of the same
// PostgreSQL in the same run. Targets: p95 <= 50 ms at 32 devices; sessions/s >= 25 % of raw session inserts/s.
// The devices run in a process of their own (this file with --load), as they would on their own phones, so the
// server's process spends its time on the server's work.
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import pino from 'pino';
import axios from 'axios';
import { QueryTypes } from 'sequelize';
import { SYNC_PROTOCOL_VERSION, type Mutation } from '@/shared/protocol/sync';
import { createApp } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { runMigrations } from '@/sync-server/src/db/migrator';
import { Clinic, initModels } from '@/sync-server/src/models';
import { createUser } from '@/sync-server/src/repositories/users-repository';
import { hashPassword } from '@/sync-server/src/services/passwords';

const SITES = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];
const ROUNDS_PER_DEVICE = Number(process.env.BENCH_ROUNDS ?? 10);

function sessionPush(deviceId: string) {
  const clientId = randomUUID();
  const sessionId = randomUUID();
  const m = (entity: Mutation['entity'], id: string, change: Record<string, unknown>): Mutation => ({
    mutationId: randomUUID(),
    entity,
    id,
    baseVersion: 0,
    change,
  });
  return {
    protocolVersion: SYNC_PROTOCOL_VERSION,
    deviceId,
    mutations: [
      m('clients', clientId, {
        firstName: 'Bench',
        lastName: 'Client',
        dateOfBirth: null,
        email: null,
        phone: null,
        notes: null,
      }),
      m('recording_sessions', sessionId, {
        clientId,
        status: 'completed',
        startedAt: '2026-11-30T09:00:00.000Z',
        finishedAt: '2026-11-30T09:12:00.000Z',
        findings: null,
        plan: null,
        followUpDate: null,
      }),
      ...SITES.map((site) =>
        m('site_recordings', randomUUID(), {
          sessionId,
          site,
          qualityVerdict: 'good',
          clipSha256: null,
          durationS: 15,
          recordedAt: '2026-11-30T09:03:00.000Z',
          skippedReason: null,
          keepAnywayNote: null,
        }),
      ),
    ],
  };
}

const pct = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];

type LoadJob = {
  url: string;
  token: string;
  devices: number;
  rounds: number;
  kind: 'push' | 'health' | 'pull';
};
type LoadResult = { latencies: number[]; seconds: number; notApplied: number };

/** The simulated devices: `devices` at once, each sending `rounds` requests one after another. */
async function runLoad(job: LoadJob): Promise<LoadResult> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 64 });
  const client = axios.create({
    baseURL: job.url,
    httpAgent: agent,
    headers: { authorization: `Bearer ${job.token}` },
  });
  const latencies: number[] = [];
  let notApplied = 0;
  const start = performance.now();
  await Promise.all(
    Array.from({ length: job.devices }, async () => {
      const deviceId = randomUUID();
      for (let i = 0; i < job.rounds; i++) {
        const t0 = performance.now();
        if (job.kind === 'push') {
          const res = await client.post('/api/sync/push', sessionPush(deviceId));
          if (res.data.results.some((r: { status: string }) => r.status !== 'applied')) notApplied += 1;
        } else if (job.kind === 'health') {
          await client.get('/api/health');
        } else {
          await client.post('/api/sync/pull', {
            protocolVersion: SYNC_PROTOCOL_VERSION,
            deviceId,
            checkpoint: '9223372036854775806',
            limit: 1,
          });
        }
        latencies.push(performance.now() - t0);
      }
    }),
  );
  agent.destroy();
  return { latencies, seconds: (performance.now() - start) / 1000, notApplied };
}

/** Runs the devices in a child process (this script again, with --load) and reads its one line of JSON. */
function loadFromOtherProcess(job: LoadJob): Promise<LoadResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [...process.execArgv, __filename, '--load', JSON.stringify(job)], {
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.on('error', reject);
    child.on('exit', (code) =>
      code === 0 ? resolve(JSON.parse(out) as LoadResult) : reject(new Error(`load process exited ${code}`)),
    );
  });
}

async function main(): Promise<void> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl)
    throw new Error('DATABASE_URL is not set: run through `npm run bench`, which starts a database.');
  await runMigrations(databaseUrl);
  const sequelize = createSequelize(databaseUrl, { poolMax: 20 });
  initModels(sequelize);
  const jwtSecret = randomUUID();
  const app = createApp({ sequelize, jwtSecret, logger: pino({ level: 'silent' }) });
  const server = http.createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const clinic = await Clinic.create({ id: randomUUID(), name: `Bench ${randomUUID().slice(0, 6)}` });
  const email = `bench.${randomUUID().slice(0, 8)}@bench.fourpoint.test`;
  await createUser(clinic.id, {
    id: randomUUID(),
    email,
    name: 'Bench Operator',
    role: 'operator',
    passwordHash: await hashPassword('bench password 1'),
  });
  const token = (await axios.post(`${url}/api/auth/sign-in`, { email, password: 'bench password 1' })).data
    .accessToken as string;

  // Raw rate: the same six rows per session as plain INSERTs, one transaction per session, same concurrency.
  async function rawSessions(concurrency: number, perWorker: number): Promise<number> {
    const start = performance.now();
    await Promise.all(
      Array.from({ length: concurrency }, async () => {
        for (let i = 0; i < perWorker; i++) {
          await sequelize.transaction(async (transaction) => {
            const clientId = randomUUID();
            const sessionId = randomUUID();
            await sequelize.query(
              `INSERT INTO clients (id, clinic_id, first_name, last_name) VALUES ($1, $2, 'Raw', 'Client')`,
              { bind: [clientId, clinic.id], transaction },
            );
            await sequelize.query(
              `INSERT INTO recording_sessions (id, clinic_id, client_id, status, started_at) VALUES ($1, $2, $3, 'completed', now())`,
              {
                bind: [sessionId, clinic.id, clientId],
                transaction,
              },
            );
            for (const site of SITES) {
              await sequelize.query(
                `INSERT INTO site_recordings (id, clinic_id, session_id, site) VALUES ($1, $2, $3, $4)`,
                {
                  bind: [randomUUID(), clinic.id, sessionId, site],
                  transaction,
                },
              );
            }
          });
        }
      }),
    );
    return (concurrency * perWorker) / ((performance.now() - start) / 1000);
  }

  const job = (devices: number, kind: LoadJob['kind']): LoadJob => ({
    url,
    token,
    devices,
    rounds: ROUNDS_PER_DEVICE,
    kind,
  });

  async function pushes(devices: number): Promise<{ p50: number; p95: number; rate: number }> {
    const result = await loadFromOtherProcess(job(devices, 'push'));
    if (result.notApplied > 0) throw new Error(`${result.notApplied} bench pushes were not applied`);
    const latencies = [...result.latencies].sort((a, b) => a - b);
    return {
      p50: pct(latencies, 50),
      p95: pct(latencies, 95),
      rate: result.latencies.length / result.seconds,
    };
  }

  // The floor under any push: the same loopback HTTP stack doing almost nothing.
  async function floor(devices: number, kind: 'health' | 'pull'): Promise<number> {
    const result = await loadFromOtherProcess(job(devices, kind));
    return result.latencies.length / result.seconds;
  }

  await pushes(4); // warm-up: JIT, pool, prepared paths
  console.log(
    `sync push of a four-site session (6 mutations), ${ROUNDS_PER_DEVICE} sessions per device, loopback`,
  );
  console.log('devices | p50 ms | p95 ms | sessions/s | raw sessions/s | ratio');
  let verdict = '';
  for (const devices of [1, 8, 32]) {
    const result = await pushes(devices);
    const raw = await rawSessions(devices, ROUNDS_PER_DEVICE);
    const ratio = result.rate / raw;
    console.log(
      `${String(devices).padStart(7)} | ${result.p50.toFixed(1).padStart(6)} | ${result.p95.toFixed(1).padStart(6)} | ${result.rate.toFixed(1).padStart(10)} | ${raw.toFixed(1).padStart(14)} | ${(ratio * 100).toFixed(0)} %`,
    );
    if (devices === 32) {
      verdict = `target at 32 devices: p95 ${result.p95.toFixed(1)} ms (<= 50: ${result.p95 <= 50 ? 'met' : 'NOT met'}), ${(ratio * 100).toFixed(0)} % of raw (>= 25 %: ${ratio >= 0.25 ? 'met' : 'NOT met'})`;
    }
  }
  const health = await floor(32, 'health');
  const pull = await floor(32, 'pull');
  console.log(
    `HTTP floor at 32 devices (devices in their own process): GET /api/health ${health.toFixed(1)} req/s, empty authenticated pull ${pull.toFixed(1)} req/s`,
  );
  const [{ count }] = await sequelize.query<{ count: string }>(
    `SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`,
    { bind: [clinic.id], type: QueryTypes.SELECT },
  );
  console.log(`${verdict}; ${count} mutations recorded`);
  server.close();
  await sequelize.close();
}

if (process.argv[2] === '--load') {
  runLoad(JSON.parse(process.argv[3]) as LoadJob)
    .then((result) => process.stdout.write(JSON.stringify(result)))
    .catch((error) => {
      console.error(error);
      process.exit(1);
    });
} else {
  main().catch((error) => {
    console.error(error);
    process.exit(1);
  });
}
