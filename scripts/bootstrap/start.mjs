// `npm start`: installs what is missing, starts a project-local PostgreSQL, migrates, loads the demo once,
// builds the web export, and serves app + API (+ local fakes of hosted services) from one command.
import fs from 'node:fs';
import path from 'node:path';
import { startCluster, portIsFree, SetupError } from './pg.mjs';
import { checkNode, dataDir, ensureNpmPackages, fail, root, run, startProcess, tsxBin } from './common.mjs';

async function main() {
  checkNode();
  ensureNpmPackages();
  const port = Number(process.env.PORT ?? 8080);
  if (!(await portIsFree(port))) {
    throw new SetupError(`Port ${port} is in use: stop what uses it or run PORT=8090 npm start`);
  }

  const cluster = await startCluster({
    dataDir: path.join(dataDir, 'pg'),
    port: Number(process.env.PGPORT ?? 54320),
    database: 'fourpoint',
  });
  const stopAll = () => cluster.stop();
  process.on('exit', stopAll);

  const env = {
    DATABASE_URL: cluster.url,
    FOURPOINT_DATA: dataDir,
    NODE_ENV: 'production',
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
  const server = startProcess(tsxBin(), ['sync-server/src/main.ts'], {
    ...env,
    PORT: String(port),
    WEB_DIST: path.join(root, 'dist'),
    FOURPOINT_DEMO_SIGN_INS: '1',
  });
  children.push(server);

  const shutdown = () => {
    for (const child of children) child.kill('SIGTERM');
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
  server.on('exit', (code) => {
    shutdown();
    cluster.stop();
    process.exit(code ?? 0);
  });

  console.log(`\nDemo sign-ins (password "tidewater brass lantern"):
  operator@demo.fourpoint.test      phone capture
  practitioner@demo.fourpoint.test  review on a wide screen
  admin@demo.fourpoint.test         team, conflicts, billing, audit
Press Ctrl-C to stop the server and its PostgreSQL.\n`);
}

main().catch(fail);
