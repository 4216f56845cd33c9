// Project-local PostgreSQL control: find Debian's server binaries (installing them when root), create a
// private cluster in an ignored folder, start it on loopback, create the database. No npm dependencies, so
// it runs before `npm ci`.
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

export class SetupError extends Error {}

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function findPgBin() {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

export function ensurePgBinaries(log = console.log) {
  let bin = findPgBin();
  if (bin) return bin;
  if (!isRoot) {
    throw new SetupError(
      'PostgreSQL server binaries not found. Install them with: sudo apt-get install -y postgresql',
    );
  }
  log('Installing PostgreSQL from Debian packages (apt-get install postgresql)...');
  aptInstall(['postgresql']);
  bin = findPgBin();
  if (!bin)
    throw new SetupError('apt-get installed postgresql but initdb is still missing; check apt output.');
  return bin;
}

export function aptInstall(packages) {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const update = spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  if (update.status !== 0)
    throw new SetupError('apt-get update failed; check the network to Debian mirrors.');
  const install = spawnSync('apt-get', ['install', '-y', '-qq', ...packages], { stdio: 'inherit', env });
  if (install.status !== 0) throw new SetupError(`apt-get install ${packages.join(' ')} failed.`);
}

// As root, PostgreSQL must run as an unprivileged user; the data folder and its parents must be reachable by it.
function asPgUser(cmd, args, opts = {}) {
  if (isRoot) return execFileSync('runuser', ['-u', 'postgres', '--', cmd, ...args], opts);
  return execFileSync(cmd, args, opts);
}

function makeTraversable(dir) {
  if (!isRoot) return;
  let current = path.resolve(dir);
  while (current !== path.dirname(current)) {
    try {
      const mode = fs.statSync(current).mode;
      if ((mode & 0o001) === 0) fs.chmodSync(current, mode | 0o001);
    } catch {
      /* parent we cannot stat: leave it */
    }
    current = path.dirname(current);
  }
}

export function portIsFree(port, host = '127.0.0.1') {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once('error', () => resolve(false));
    server.once('listening', () => server.close(() => resolve(true)));
    server.listen(port, host);
  });
}

/**
 * Starts (or reuses) a cluster in `dataDir` on `port`; returns { url, stop }.
 * `stop` only stops a server this call started.
 */
export async function startCluster({ dataDir, port, database, log = console.log }) {
  const bin = ensurePgBinaries(log);
  const user = 'fourpoint';
  fs.mkdirSync(dataDir, { recursive: true });
  makeTraversable(dataDir);
  if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
  fs.chmodSync(dataDir, 0o700);

  if (!fs.existsSync(path.join(dataDir, 'PG_VERSION'))) {
    log(`Creating a PostgreSQL cluster in ${dataDir}`);
    asPgUser(
      path.join(bin, 'initdb'),
      ['-D', dataDir, '-A', 'trust', '-U', user, '-E', 'UTF8', '--no-locale'],
      {
        stdio: 'ignore',
      },
    );
  }

  let startedHere = false;
  const status = spawnSync(
    isRoot ? 'runuser' : path.join(bin, 'pg_ctl'),
    isRoot
      ? ['-u', 'postgres', '--', path.join(bin, 'pg_ctl'), '-D', dataDir, 'status']
      : ['-D', dataDir, 'status'],
  );
  if (status.status !== 0) {
    if (!(await portIsFree(port))) {
      throw new SetupError(
        `Port ${port} for PostgreSQL is in use; stop what uses it or set PGPORT to another port.`,
      );
    }
    try {
      asPgUser(
        path.join(bin, 'pg_ctl'),
        [
          '-D',
          dataDir,
          '-o',
          `-c listen_addresses=127.0.0.1 -p ${port} -k ${dataDir} -c fsync=off`,
          '-l',
          path.join(dataDir, 'server.log'),
          '-w',
          'start',
        ],
        { stdio: 'ignore' },
      );
    } catch {
      const tail = fs.existsSync(path.join(dataDir, 'server.log'))
        ? fs.readFileSync(path.join(dataDir, 'server.log'), 'utf8').split('\n').slice(-5).join('\n')
        : '';
      throw new SetupError(`PostgreSQL did not start (see ${dataDir}/server.log):\n${tail}`);
    }
    startedHere = true;
  }

  const exists = asPgUser(
    path.join(bin, 'psql'),
    [
      '-h',
      '127.0.0.1',
      '-p',
      String(port),
      '-U',
      user,
      '-d',
      'postgres',
      '-tAc',
      `SELECT 1 FROM pg_database WHERE datname='${database}'`,
    ],
    { encoding: 'utf8' },
  ).trim();
  if (exists !== '1') {
    asPgUser(path.join(bin, 'createdb'), ['-h', '127.0.0.1', '-p', String(port), '-U', user, database], {
      stdio: 'ignore',
    });
  }

  const stop = () => {
    if (!startedHere) return;
    startedHere = false;
    try {
      asPgUser(path.join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', 'stop'], { stdio: 'ignore' });
    } catch {
      /* already stopped */
    }
  };
  return { url: `postgres://${user}@127.0.0.1:${port}/${database}`, stop, bin };
}

// `node scripts/bootstrap/pg.mjs` starts the development cluster and prints its URL (for helpers and psql).
if (import.meta.url === `file://${process.argv[1]}`) {
  const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '../..');
  startCluster({
    dataDir: path.join(root, '.data', 'dev-pg'),
    port: Number(process.env.PGPORT ?? 54329),
    database: 'fourpoint_dev',
  }).then(({ url }) => console.log(url));
}
