// `npm start`: installs what is missing, starts a project-local PostgreSQL, migrates, loads the demo once,
// builds the web export, and serves app + API (+ local fakes of hosted services) from one command.
// INSTANCES=N (default 1) runs N server processes on internal loopback ports behind HAProxy on the public port.
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { startCluster, portIsFree, SetupError } from './pg.mjs';
import { installSecrets } from './secrets.mjs';
import { ensureHaproxy, startBalancer } from './balancer.mjs';
import { checkNode, dataDir, ensureNpmPackages, fail, root, run, startProcess, tsxBin } from './common.mjs';

async function main() {
  checkNode();
  ensureNpmPackages();
  const port = Number(process.env.PORT ?? 8080);
  if (!(await portIsFree(port))) {
    throw new SetupError(`Port ${port} is in use: stop what uses it or run PORT=8090 npm start`);
  }
  const instanceCount = Number(process.env.INSTANCES ?? 1);
  if (!Number.isInteger(instanceCount) || instanceCount < 1 || instanceCount > 16)
    throw new SetupError(`INSTANCES must be a whole number from 1 to 16, not "${process.env.INSTANCES}".`);
  if (instanceCount > 1) ensureHaproxy();

  const cluster = await startCluster({
    dataDir: path.join(dataDir, 'pg'),
    port: Number(process.env.PGPORT ?? 54320),
    database: 'fourpoint',
    // fsync stays on: a crash or power cut must not corrupt a clinic's records.
  });
  const secrets = installSecrets(dataDir);
  const stopAll = () => cluster.stop();
  process.on('exit', stopAll);

  const env = {
    DATABASE_URL: cluster.url,
    FOURPOINT_DATA: dataDir,
    NODE_ENV: 'production',
    // The server refuses to start without these; the payments fake signs its webhooks with the same secret.
    ...secrets,
    CLINIC_KEYS_DIR: process.env.CLINIC_KEYS_DIR ?? path.join(dataDir, 'clinic-keys'),
    // Local fakes of the hosted services (mail, payments, object storage) and the server agree on these.
    SMTP_PORT: process.env.SMTP_PORT ?? '2525',
    MAIL_FAKE_HTTP_PORT: process.env.MAIL_FAKE_HTTP_PORT ?? '8025',
    PAYMENTS_FAKE_PORT: process.env.PAYMENTS_FAKE_PORT ?? '12111',
    S3_FAKE_PORT: process.env.S3_FAKE_PORT ?? '4569',
  };
  run(tsxBin(), ['sync-server/src/cli/prepare-db.ts'], {
    env,
    failMessage: 'Preparing the database failed (see above).',
  });
  run('node', ['scripts/build-web.mjs'], { failMessage: 'Building the web app failed (see above).' });

  const fakes = path.join(root, 'sync-server/fakes/run-fakes.ts');
  const children = [];
  if (fs.existsSync(fakes)) children.push(startProcess(tsxBin(), [fakes], env));
  const serverEnv = { ...env, WEB_DIST: path.join(root, 'dist'), FOURPOINT_DEMO_SIGN_INS: '1' };
  const servers = [];
  if (instanceCount === 1) {
    servers.push(startProcess(tsxBin(), ['sync-server/src/main.ts'], { ...serverEnv, PORT: String(port) }));
  } else {
    const instances = [];
    for (let i = 1; i <= instanceCount; i++) instances.push({ name: `i${i}`, port: await freePort() });
    for (const instance of instances)
      servers.push(
        startProcess(tsxBin(), ['sync-server/src/main.ts'], {
          ...serverEnv,
          PORT: String(instance.port),
          FOURPOINT_INSTANCE: instance.name,
          // The balancer on loopback is the only proxy trusted for the client's address (sign-in limits).
          TRUST_PROXY: 'loopback',
        }),
      );
    const balancer = startBalancer({ dir: path.join(dataDir, 'balancer'), publicPort: port, instances });
    children.push(balancer);
    balancer.on('exit', () => shutdown());
    console.log(`${instanceCount} server instances behind HAProxy on port ${port}.`);
  }
  children.push(...servers);

  const shutdown = () => {
    for (const child of children) if (child.exitCode === null) child.kill('SIGTERM');
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
  let running = servers.length;
  for (const server of servers)
    server.on('exit', (code) => {
      running -= 1;
      if (running > 0) return;
      shutdown();
      cluster.stop();
      process.exit(code ?? 0);
    });

  console.log(`\nDemo sign-ins (password ${secrets.FOURPOINT_DEMO_PASSWORD}, kept in .data/secrets.env):
  operator@demo.fourpoint.test      phone capture
  practitioner@demo.fourpoint.test  review on a wide screen
  admin@demo.fourpoint.test         team, conflicts, billing, audit
Press Ctrl-C to stop the server and its PostgreSQL.\n`);
}

/** A port the OS has just handed out on loopback, for one instance behind the balancer. */
function freePort() {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address();
      probe.close(() => resolve(port));
    });
  });
}

main().catch(fail);
