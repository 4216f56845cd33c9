// What this proves: the PostgreSQL that `npm start` runs (scripts/bootstrap/pg.mjs) writes through to disk
// (fsync on, so a crash cannot corrupt a clinic's records) and lets in only whoever has its password
// (scram-sha-256), kept in a file only its owner reads; and a cluster made by an older version (trust, fsync
// off) gets both on its next start with its data kept. OWASP ASVS 4.0.3 V2.10.4 (no database password in the
// code) and V14.1 (secure build and deployment configuration). Each test uses a throwaway cluster on a free port.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { Client } from 'pg';
import { databaseUrl } from './helpers/test-app';

jest.setTimeout(120_000);

type Cluster = { url: string; bin: string; passwordFile: string };
const PG_MJS = path.resolve(__dirname, '../../scripts/bootstrap/pg.mjs');
const isRoot = process.getuid?.() === 0;

// pg.mjs is plain ES-module Node, which jest's sandbox cannot import: run it as npm start does, in Node.
function startCluster(options: { dataDir: string; port: number; database: string }): Cluster {
  const script = `import { startCluster } from ${JSON.stringify(PG_MJS)};
const { url, bin, passwordFile } = await startCluster({ ...${JSON.stringify(options)}, log: () => undefined });
console.log(JSON.stringify({ url, bin, passwordFile }));`;
  const out = execFileSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' });
  return JSON.parse(out.trim().split('\n').at(-1)!) as Cluster;
}

function pgBin(): string {
  const script = `import { ensurePgBinaries } from ${JSON.stringify(PG_MJS)}; console.log(ensurePgBinaries());`;
  return execFileSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' }).trim();
}

function asPgUser(bin: string, cmd: string, args: string[]): void {
  if (isRoot)
    execFileSync('runuser', ['-u', 'postgres', '--', path.join(bin, cmd), ...args], { stdio: 'ignore' });
  else execFileSync(path.join(bin, cmd), args, { stdio: 'ignore' });
}

const stopCluster = (bin: string, dataDir: string) =>
  asPgUser(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop']);

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

async function query(config: ConstructorParameters<typeof Client>[0], sql: string): Promise<unknown[]> {
  const client = new Client(config);
  await client.connect();
  try {
    return (await client.query(sql)).rows;
  } finally {
    await client.end();
  }
}

const modeOf = (file: string) => fs.statSync(file).mode & 0o777;
const hbaRules = (dataDir: string) =>
  fs
    .readFileSync(path.join(dataDir, 'pg_hba.conf'), 'utf8')
    .split('\n')
    .filter((line) => line.trim() && !line.trim().startsWith('#'));

/** Checks that only the right password gets in, and returns the server's fsync setting. */
async function expectPasswordOnly(port: number, database: string, password: string): Promise<string> {
  const at = { host: '127.0.0.1', port, user: 'fourpoint', database };
  // RFC 5802 (SCRAM): the server asks for proof of the password; with none, or a wrong one, it closes the door.
  await expect(query(at, 'SELECT 1')).rejects.toThrow();
  await expect(query({ ...at, password: 'not-the-password' }, 'SELECT 1')).rejects.toThrow(
    /password authentication failed/,
  );
  const [row] = (await query({ ...at, password }, 'SHOW fsync')) as [{ fsync: string }];
  return row.fsync;
}

let workDir: string;
beforeEach(() => {
  workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-pg-'));
  fs.chmodSync(workDir, 0o755);
});
afterEach(() => fs.rmSync(workDir, { recursive: true, force: true }));

describe('scripts/bootstrap/pg.mjs', () => {
  test('when npm start makes its cluster, then fsync is on, only the generated password gets in, and the password file is mode 600', async () => {
    const port = await freePort();
    const dataDir = path.join(workDir, 'pg');
    // The options scripts/bootstrap/start.mjs passes: no fsync choice, so the default.
    const cluster = startCluster({ dataDir, port, database: 'fourpoint' });
    try {
      const password = fs.readFileSync(cluster.passwordFile, 'utf8').trim();
      expect(password).toMatch(/^[0-9a-f]{64}$/);
      expect(modeOf(cluster.passwordFile)).toBe(0o600);
      expect(new URL(cluster.url).password).toBe(password);
      expect(await expectPasswordOnly(port, 'fourpoint', password)).toBe('on');
      expect(hbaRules(dataDir).every((rule) => /\bscram-sha-256\s*$/.test(rule))).toBe(true);
    } finally {
      stopCluster(cluster.bin, dataDir);
    }
  });

  test('when a cluster made by an older version (trust, fsync off) is still running, then the next start sets a password, turns fsync on and keeps the data', async () => {
    const bin = pgBin();
    const port = await freePort();
    const dataDir = path.join(workDir, 'pg');
    fs.mkdirSync(dataDir, { mode: 0o700 });
    if (isRoot) execFileSync('chown', ['postgres:postgres', dataDir]);
    // Exactly what the older pg.mjs ran.
    asPgUser(bin, 'initdb', ['-D', dataDir, '-A', 'trust', '-U', 'fourpoint', '-E', 'UTF8', '--no-locale']);
    asPgUser(bin, 'pg_ctl', [
      '-D',
      dataDir,
      '-o',
      `-c listen_addresses=127.0.0.1 -p ${port} -k ${dataDir} -c fsync=off`,
      '-l',
      path.join(dataDir, 'server.log'),
      '-w',
      'start',
    ]);
    try {
      const trusted = { host: '127.0.0.1', port, user: 'fourpoint' };
      await query({ ...trusted, database: 'postgres' }, 'CREATE DATABASE fourpoint');
      await query(
        { ...trusted, database: 'fourpoint' },
        `CREATE TABLE kept (note text); INSERT INTO kept VALUES ('recorded before the upgrade')`,
      );

      const cluster = startCluster({ dataDir, port, database: 'fourpoint' });
      const password = fs.readFileSync(cluster.passwordFile, 'utf8').trim();
      expect(modeOf(cluster.passwordFile)).toBe(0o600);
      expect(await expectPasswordOnly(port, 'fourpoint', password)).toBe('on');
      expect(hbaRules(dataDir).some((rule) => /\btrust\b/.test(rule))).toBe(false);
      expect(await query(cluster.url, 'SELECT note FROM kept')).toEqual([
        { note: 'recorded before the upgrade' },
      ]);
    } finally {
      stopCluster(bin, dataDir);
    }
  });

  test('when the tests make their throwaway cluster, then they opt out of fsync explicitly and still need the password', async () => {
    const url = new URL(databaseUrl());
    expect(url.password).not.toBe('');
    const [row] = (await query(databaseUrl(), 'SHOW fsync')) as [{ fsync: string }];
    expect(row.fsync).toBe('off');
  });
});
