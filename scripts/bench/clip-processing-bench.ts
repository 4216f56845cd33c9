// Clip processing benchmark: the delay of a cheap request (GET /api/health, probed every 10 ms) while a sealed
// 10-minute 48 kHz clip is uploaded, opened and analysed, beside a baseline with nothing else to do.
// Target: max delay under load <= 100 ms. The server runs in a process of its own (the real app), so the probe
// times its event loop, not this one's.
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import readline from 'node:readline';
import axios from 'axios';
import { encodeWav16 } from '@/shared/analysis/wav';
import { sealClip, sha256Hex } from '@/shared/seal';
import { createHttpTransport } from '@/shared/sync';
import { createSequelize } from '@/sync-server/src/db/database';
import { runMigrations } from '@/sync-server/src/db/migrator';
import { createClinic } from '@/sync-server/src/repositories/clinics-repository';
import { createUser } from '@/sync-server/src/repositories/users-repository';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { hashPassword } from '@/sync-server/src/services/passwords';

const root = path.resolve(__dirname, '../..');
const SECONDS = 600;
const RATE = 48_000;
const PROBE_EVERY_MS = 10;
const BASELINE_MS = 5_000;
const TARGET_MS = 100;

// Bursts twice a second over a little noise: a long clip the analysis has to walk through (not a reference).
function longWav(): Uint8Array {
  const samples = new Float32Array(SECONDS * RATE);
  for (let i = 0; i < samples.length; i++) {
    const t = i / RATE;
    samples[i] =
      t % 0.8 < 0.08 ? 0.5 * Math.sin(2 * Math.PI * 45 * t) : 0.002 * Math.sin(2 * Math.PI * 7 * t);
  }
  return encodeWav16(samples, RATE);
}

/** Probes /api/health until `until` settles; returns each request's time in ms. */
async function probe(url: string, until: Promise<unknown>): Promise<number[]> {
  const times: number[] = [];
  let done = false;
  void until.finally(() => (done = true));
  while (!done) {
    const start = performance.now();
    await axios.get(`${url}/api/health`, { validateStatus: () => true });
    times.push(performance.now() - start);
    await new Promise((r) => setTimeout(r, PROBE_EVERY_MS));
  }
  return times;
}

const figures = (times: number[]) => {
  const sorted = [...times].sort((a, b) => a - b);
  const p99 = sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * 0.99))];
  return `max ${sorted[sorted.length - 1].toFixed(1)} ms, p99 ${p99.toFixed(1)} ms, p50 ${sorted[Math.floor(sorted.length / 2)].toFixed(1)} ms (${sorted.length} requests)`;
};

async function main() {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) throw new Error('DATABASE_URL is not set: run through `npm run bench`.');
  const sequelize = createSequelize(databaseUrl);
  await runMigrations(databaseUrl);
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-clip-bench-'));
  const jwtSecret = `bench-${randomUUID()}`;
  const clinic = { id: randomUUID(), name: `Clip bench ${randomUUID().slice(0, 8)}` };
  await createClinic(sequelize, clinic);
  const email = `operator.${randomUUID().slice(0, 8)}@bench.fourpoint.test`;
  await createUser(sequelize, clinic.id, {
    id: randomUUID(),
    email,
    name: 'Bench Operator',
    role: 'operator',
    passwordHash: await hashPassword('correct horse battery staple'),
  });
  const sealed = sealClip(longWav(), new ClinicKeyStore(path.join(dataDir, 'keys')).publicKey(clinic.id));

  const server = spawn(
    process.execPath,
    ['--import', 'tsx', path.join(root, 'tests/server/sync-helpers/upload-server-process.ts')],
    {
      cwd: root,
      env: { ...process.env, JWT_SECRET: jwtSecret, DATA_DIR: dataDir, PORT: '0' },
      stdio: ['ignore', 'pipe', 'inherit'],
    },
  );
  try {
    const line = await new Promise<string>((resolve) =>
      readline.createInterface({ input: server.stdout! }).once('line', resolve),
    );
    const url = `http://127.0.0.1:${(JSON.parse(line) as { port: number }).port}`;
    const token = (
      await axios.post(`${url}/api/auth/sign-in`, { email, password: 'correct horse battery staple' })
    ).data.accessToken as string;

    const baseline = await probe(url, new Promise((r) => setTimeout(r, BASELINE_MS)));
    const transport = createHttpTransport({
      baseUrl: url,
      getAccessToken: () => token,
      chunkSize: 4 * 1024 * 1024,
    });
    const started = performance.now();
    const upload = transport.uploadClip({
      sha256: sha256Hex(sealed),
      bytes: sealed,
      onUploadUrl: () => undefined,
      onProgress: () => undefined,
    });
    const loaded = await probe(url, upload);
    await upload;
    const tookS = (performance.now() - started) / 1000;
    const status = await transport.blobStatus(sha256Hex(sealed));
    const underLoad = Math.max(...loaded);
    console.log(
      `clip: ${SECONDS / 60} min at ${RATE} Hz, ${(sealed.length / 1e6).toFixed(1)} MB sealed; uploaded, opened and analysed in ${tookS.toFixed(1)} s (state ${status.state})`,
    );
    console.log(`GET /api/health, nothing else running:     ${figures(baseline)}`);
    console.log(`GET /api/health, while the clip is processed: ${figures(loaded)}`);
    console.log(
      `max delay under load ${underLoad.toFixed(1)} ms (target <= ${TARGET_MS} ms): ${underLoad <= TARGET_MS ? 'met' : 'NOT met'}`,
    );
  } finally {
    server.kill('SIGTERM');
    await sequelize.close();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
