import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { createApp } from './app';
import { MissingSecretError, readSecrets, type Secrets } from './config/secrets';
import { createSequelize } from './db/database';
import { backgroundJobs } from './jobs/background-jobs';
import { startJobQueue } from './jobs/job-queue';
import { markStopping } from './lifecycle';
import { syncServicesFor } from './services/sync-services';

const logger = pino({ level: process.env.LOG_LEVEL ?? 'info' });

function fail(message: string): never {
  console.error(message);
  process.exit(1);
}

/**
 * Follow-up reminders, report e-mail retries and the purge of erased clients run as jobs on the queue shared by
 * every instance (jobs/job-queue.ts). Staged uploads are processed at start-up by every instance: the server may
 * have died between an upload's last byte and its processing (a per-upload lock keeps that to one instance).
 */
function startBackgroundWork(
  sequelize: ReturnType<typeof createSequelize>,
  jwtSecret: string,
  instance: string,
) {
  const queue = startJobQueue(sequelize, backgroundJobs(sequelize, jwtSecret), {
    instance,
    pollMs: Number(process.env.JOB_POLL_MS ?? 30_000),
    onError: (job, error) => logger.warn({ err: error, job }, 'background job failed; it is retried later'),
  });
  syncServicesFor(sequelize)
    .uploads.processStaged()
    .then(
      (counts) => logger.info(counts, 'staged uploads processed at start-up'),
      (error) => logger.warn({ err: error }, 'staged uploads could not be processed at start-up'),
    );
  return queue;
}

/** How long a stopping instance waits for requests in flight before it cuts them. */
const SHUTDOWN_GRACE_MS = Number(process.env.SHUTDOWN_GRACE_MS ?? 25_000);

function main(): void {
  const port = Number(process.env.PORT ?? 8080);
  const host = process.env.HOST ?? '127.0.0.1';
  if (!Number.isInteger(port) || port < 0 || port > 65535)
    fail(`PORT must be a whole number from 0 to 65535, not "${process.env.PORT}".`);
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl)
    fail('DATABASE_URL is not set: run `npm start`, which sets up the database, or set it yourself.');
  const webDist = process.env.WEB_DIST ? path.resolve(process.env.WEB_DIST) : undefined;
  let secrets: Secrets;
  try {
    secrets = readSecrets(process.env);
  } catch (error) {
    if (error instanceof MissingSecretError) fail(error.message);
    throw error;
  }

  const sequelize = createSequelize(databaseUrl);
  // Behind the balancer each process is named by it (i1, i2...); alone, by its host and process id.
  const instance = process.env.FOURPOINT_INSTANCE || `${os.hostname()}-${process.pid}`;
  const app = createApp({
    sequelize,
    jwtSecret: secrets.jwtSecret,
    webDist,
    logger: logger.child({ instance }),
    instanceName: instance,
    // TRUST_PROXY=loopback when a balancer on this machine forwards the client's address (npm start sets it).
    trustProxy: process.env.TRUST_PROXY || false,
  });
  const jobs = startBackgroundWork(sequelize, secrets.jwtSecret, instance);
  const server = app.listen(port, host);

  server.on('listening', () => {
    const address = server.address();
    const actual = typeof address === 'object' && address ? address.port : port;
    const shown = host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host;
    console.log(`Fourpoint is running at http://${shown}:${actual}`);
  });
  server.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EADDRINUSE')
      fail(`Port ${port} is in use: stop what uses it or set PORT=... npm start`);
    if (error.code === 'EACCES')
      fail(`Port ${port} needs more rights than this user has: set PORT=... npm start`);
    fail(`The server could not start: ${error.message}`);
  });

  // Stopping: readiness answers 503 at once (the balancer stops sending), the listener closes (no new
  // connections), idle keep-alive connections close, requests in flight and running jobs finish, then the
  // process exits. Requests still open after SHUTDOWN_GRACE_MS are cut, so a stop never hangs.
  let closing = false;
  const close = (signal: string) => {
    if (closing) return;
    closing = true;
    markStopping();
    logger.info({ signal }, 'stopping: finishing requests in flight and running jobs');
    const requestsDone = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections();
    setTimeout(() => server.closeAllConnections(), SHUTDOWN_GRACE_MS).unref();
    Promise.all([requestsDone, jobs.stop()])
      .then(() => sequelize.close())
      .finally(() => process.exit(0));
  };
  process.on('SIGINT', () => close('SIGINT'));
  process.on('SIGTERM', () => close('SIGTERM'));
}

main();
