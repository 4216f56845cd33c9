// Shared steps of `npm start` and `npm test`. Uses only Node's standard library: it runs before `npm ci`.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { SetupError, aptInstall } from './pg.mjs';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const dataDir = path.join(root, '.data');

export function checkNode() {
  const [major, minor] = process.versions.node.split('.').map(Number);
  if (major < 20 || (major === 20 && minor < 19)) {
    throw new SetupError(`Node.js ${process.versions.node} is too old: install Node.js 20.19 or newer.`);
  }
}

/** `npm ci` when node_modules is missing or older than the lockfile. */
export function ensureNpmPackages(log = console.log) {
  const lock = path.join(root, 'package-lock.json');
  const installed = path.join(root, 'node_modules', '.package-lock.json');
  const fresh = fs.existsSync(installed) && fs.statSync(installed).mtimeMs >= fs.statSync(lock).mtimeMs;
  if (fresh) return;
  log('Installing npm packages (npm ci)...');
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0)
    throw new SetupError('npm ci failed: check the output above and the npm registry.');
}

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** Debian's Chromium, poppler-utils (pdftoppm) and HAProxy (tests/server/instances.test.ts), for the tests. */
export function ensureTestBinaries(log = console.log) {
  const missing = [];
  if (!fs.existsSync('/usr/sbin/haproxy')) missing.push('haproxy');
  if (!fs.existsSync('/usr/bin/chromium')) missing.push('chromium');
  if (!fs.existsSync('/usr/bin/pdftoppm')) missing.push('poppler-utils');
  if (missing.length === 0) return;
  if (!isRoot)
    throw new SetupError(
      `Missing ${missing.join(', ')}: install with sudo apt-get install -y ${missing.join(' ')}`,
    );
  log(`Installing ${missing.join(', ')} from Debian packages...`);
  aptInstall(missing);
}

export function tsxBin() {
  return path.join(root, 'node_modules', '.bin', 'tsx');
}

/** Runs a command to completion; throws SetupError(message) when it fails. */
export function run(cmd, args, { env = {}, failMessage, quiet = false } = {}) {
  const result = spawnSync(cmd, args, {
    cwd: root,
    stdio: quiet ? ['ignore', 'pipe', 'pipe'] : 'inherit',
    env: { ...process.env, ...env },
    encoding: 'utf8',
  });
  if (result.status !== 0) {
    if (quiet) process.stderr.write((result.stdout ?? '') + (result.stderr ?? ''));
    throw new SetupError(failMessage ?? `${cmd} ${args.join(' ')} failed`);
  }
  return result;
}

export function startProcess(cmd, args, env) {
  return spawn(cmd, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
}

export function fail(error) {
  if (error instanceof SetupError) {
    console.error(`\n${error.message}`);
    process.exit(1);
  }
  throw error;
}
