// The load balancer in front of several server processes: Debian's HAProxy, configured into a folder of its own
// under .data/ and run in the foreground as the current user (no root paths, no system service). No npm
// dependencies, so it runs before `npm ci`.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { SetupError, aptInstall } from './pg.mjs';

const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export function findHaproxy() {
  for (const candidate of ['/usr/sbin/haproxy', '/usr/bin/haproxy'])
    if (fs.existsSync(candidate)) return candidate;
  return null;
}

/** HAProxy from Debian's packages, installed as PostgreSQL is (apt-get as root, else a clear line). */
export function ensureHaproxy(log = console.log) {
  const found = findHaproxy();
  if (found) return found;
  if (!isRoot)
    throw new SetupError(
      'HAProxy is needed for INSTANCES > 1: install it with sudo apt-get install -y haproxy',
    );
  log('Installing HAProxy from Debian packages (apt-get install haproxy)...');
  aptInstall(['haproxy']);
  const installed = findHaproxy();
  if (!installed) throw new SetupError('apt-get installed haproxy but its binary is still missing.');
  return installed;
}

/**
 * The configuration: one public port, round robin over the instances, each checked on its readiness route so
 * one that is draining (SIGTERM) or has lost its database gets no new requests. A request whose connection
 * could not be made at all is sent to another instance (`retry-on conn-failure`); one that reached an instance
 * is never sent twice, since a push or an upload must not run twice.
 */
export function haproxyConfig({ publicPort, host = '127.0.0.1', instances, pidFile }) {
  const servers = instances.map(({ name, port }) => `  server ${name} 127.0.0.1:${port} check`).join('\n');
  return `# Written by scripts/bootstrap/balancer.mjs; regenerated at every start.
global
  log stderr format raw local0 warning
  pidfile ${pidFile}
  maxconn 4096

defaults
  mode http
  log global
  option httplog
  # Each instance reads the client's address from X-Forwarded-For (express 'trust proxy' = loopback).
  option forwardfor
  timeout connect 5s
  # A clip upload on a slow link and the longest report export fit in these.
  timeout client 120s
  timeout server 120s
  timeout http-request 30s
  retries 3
  retry-on conn-failure
  option redispatch

frontend public
  bind ${host}:${publicPort}
  default_backend instances

backend instances
  balance roundrobin
  option httpchk GET /api/health/ready
  http-check expect status 200
  # The check is for an instance that cannot serve (database or storage gone, stopping), not for a busy one.
  # /api/health/ready answers from a state its own probe keeps fresh (services/readiness-probe.ts) without
  # waiting for the request pool, so its answer time is only the event loop's delay; with 32 devices pushing on
  # two cores shared with PostgreSQL that reached a second, which is what took instances out under the old
  # inter 1s (timeout = inter), fall 1. Now: a check every 2 s may take 5 s to answer, three misses in a row
  # (about 6 to 15 s) take an instance out, two answers in a row bring it back (fastinter 1s confirms a change
  # quickly). A stopping or killed instance needs no check to be avoided: it refuses connections at once, and
  # retry-on conn-failure with redispatch sends those requests to another instance.
  timeout check 5s
  default-server inter 2s fastinter 1s downinter 2s fall 3 rise 2
${servers}
`;
}

/**
 * Writes the configuration into `dir` and starts HAProxy in the foreground (`-db`); returns the child process.
 * Resolves once the public port accepts connections (checked with HAProxy's own -c first, so a bad config
 * fails with its message instead of a silent exit).
 */
export function startBalancer({ dir, publicPort, host, instances, log = console.log }) {
  const bin = ensureHaproxy(log);
  fs.mkdirSync(dir, { recursive: true });
  const configFile = path.join(dir, 'haproxy.cfg');
  fs.writeFileSync(
    configFile,
    haproxyConfig({ publicPort, host, instances, pidFile: path.join(dir, 'haproxy.pid') }),
  );
  const check = spawnSync(bin, ['-c', '-q', '-f', configFile], { encoding: 'utf8' });
  if (check.status !== 0)
    throw new SetupError(`HAProxy refused ${configFile}:\n${check.stdout}${check.stderr}`);
  return spawn(bin, ['-db', '-f', configFile], { stdio: ['ignore', 'inherit', 'inherit'] });
}

// As a command (for the tests, whose jest workers cannot import this ES module):
//   node scripts/bootstrap/balancer.mjs --find                      exits 0 when HAProxy is installed
//   node scripts/bootstrap/balancer.mjs DIR PUBLIC_PORT NAME:PORT...  runs it until SIGTERM
if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
  const [first, publicPort, ...backends] = process.argv.slice(2);
  if (first === '--find') process.exit(findHaproxy() ? 0 : 1);
  const instances = backends.map((b) => ({ name: b.split(':')[0], port: Number(b.split(':')[1]) }));
  const child = startBalancer({ dir: first, publicPort: Number(publicPort), instances });
  for (const signal of ['SIGTERM', 'SIGINT']) process.on(signal, () => child.kill(signal));
  child.on('exit', (code) => process.exit(code ?? 0));
}
