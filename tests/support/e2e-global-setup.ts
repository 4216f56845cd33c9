// Starts the real server (API + built web export) on a free port against a fresh demo database, for the
// end-to-end tests. `npm test` passes the cluster in FOURPOINT_TEST_PG_URL; a bare jest run starts one.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { Client } from 'pg';

const root = path.resolve(__dirname, '../..');
type Cluster = { url: string; stop: () => void };
type E2eGlobals = {
  __fourpointE2e?: {
    server: ChildProcess;
    fakes?: ChildProcess;
    cluster?: Cluster;
    clusterUrl: string;
    databaseName: string;
    stateDir: string;
  };
};

// A real dynamic import: ts-jest would otherwise turn `import()` into `require()` of an ES module.
const importEsm = new Function('specifier', 'return import(specifier)') as (s: string) => Promise<unknown>;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

async function recreateDatabase(clusterUrl: string, name: string): Promise<string> {
  const admin = new Client({ connectionString: clusterUrl.replace(/\/[^/]+$/, '/postgres') });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  await admin.query(`CREATE DATABASE ${name}`);
  await admin.end();
  return clusterUrl.replace(/\/[^/]+$/, `/${name}`);
}

async function waitForHealth(url: string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null)
      throw new Error(`The server exited with code ${child.exitCode} during start-up.`);
    try {
      const response = await fetch(`${url}/api/health`);
      if (response.ok) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('The server did not answer /api/health within 60 s.');
}

export default async function globalSetup(): Promise<void> {
  const globals = globalThis as E2eGlobals;
  let cluster: Cluster | undefined;
  let clusterUrl = process.env.FOURPOINT_TEST_PG_URL;
  if (!clusterUrl) {
    const pg = (await importEsm(path.join(root, 'scripts/bootstrap/pg.mjs'))) as {
      startCluster: (o: {
        dataDir: string;
        port: number;
        database: string;
        fsync: boolean;
        log?: (m: string) => void;
      }) => Promise<Cluster>;
    };
    cluster = await pg.startCluster({
      dataDir: process.env.FOURPOINT_TEST_PG_DIR ?? path.join(root, '.data/test-pg'),
      port: Number(process.env.TEST_PGPORT ?? 54339),
      database: 'fourpoint_test',
      // A throwaway cluster: speed over crash safety.
      fsync: false,
      log: () => undefined,
    });
    clusterUrl = cluster.url;
  }

  const databaseName = `fourpoint_e2e_${process.pid}`;
  const databaseUrl = await recreateDatabase(clusterUrl, databaseName);
  // Per run, so two e2e runs on one machine (two contributors, or a rerun) do not share files.
  const stateDir = path.join(root, '.data', `e2e-${process.pid}`);
  fs.rmSync(stateDir, { recursive: true, force: true });
  fs.mkdirSync(stateDir, { recursive: true });
  const tsx = path.join(root, 'node_modules/.bin/tsx');
  // A fresh set of secrets per run: the server verifies webhooks with the one the payments fake signs with.
  const { newSecrets } = (await importEsm(path.join(root, 'scripts/bootstrap/secrets.mjs'))) as {
    newSecrets: () => Record<string, string>;
  };
  const secrets = newSecrets();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...secrets,
    DATABASE_URL: databaseUrl,
    FOURPOINT_DATA: stateDir,
    BLOB_DIR: path.join(stateDir, 'blobs'),
    NODE_ENV: 'test',
    // The local fakes of hosted services and the server must agree on these; each run gets free ones.
    SMTP_PORT: String(await freePort()),
    MAIL_FAKE_HTTP_PORT: String(await freePort()),
    PAYMENTS_FAKE_PORT: String(await freePort()),
    S3_FAKE_PORT: String(await freePort()),
  };

  const prepared = spawnSync(tsx, ['sync-server/src/cli/prepare-db.ts'], {
    cwd: root,
    env,
    stdio: 'inherit',
  });
  if (prepared.status !== 0) throw new Error('Preparing the e2e database failed.');
  if (!fs.existsSync(path.join(root, 'dist/index.html'))) {
    const built = spawnSync('node', ['scripts/build-web.mjs'], { cwd: root, stdio: 'inherit' });
    if (built.status !== 0) throw new Error('Building the web export failed.');
  }

  const port = await freePort();
  const fakesEntry = path.join(root, 'sync-server/fakes/run-fakes.ts');
  let fakes: ChildProcess | undefined;
  if (fs.existsSync(fakesEntry)) fakes = spawn(tsx, [fakesEntry], { cwd: root, env, stdio: 'inherit' });
  const server = spawn(tsx, ['sync-server/src/main.ts'], {
    cwd: root,
    env: { ...env, PORT: String(port), WEB_DIST: path.join(root, 'dist') },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  globals.__fourpointE2e = { server, fakes, cluster, clusterUrl, databaseName, stateDir };
  const url = `http://127.0.0.1:${port}`;
  await waitForHealth(url, server);
  process.env.E2E_BASE_URL = url;
  process.env.E2E_DATABASE_URL = databaseUrl;
  process.env.FOURPOINT_DEMO_PASSWORD = secrets.FOURPOINT_DEMO_PASSWORD;
}
