import pino, { type Logger } from 'pino';
import { createApp } from './app';
import { composeServices, replaceServices, syncServicesFor } from './composition-root';
import { MissingSecretError } from './config/secrets';
import { ConfigError, loadConfig, type Config } from './config/settings';
import { createSequelize } from './db/database';
import { backgroundJobs } from './jobs/background-jobs';
import { startJobQueue } from './jobs/job-queue';
import { markStopping } from './lifecycle';

function fail(message: string): never {
  console.error(message);
  process.exit(1);
}

/**
 * Follow-up reminders, report e-mail retries and the purge of erased clients run as jobs on the queue shared by
 * every instance (jobs/job-queue.ts). Staged uploads are processed at start-up by every instance: the server may
 * have died between an upload's last byte and its processing (a per-upload lock keeps that to one instance).
 */
function startBackgroundWork(sequelize: ReturnType<typeof createSequelize>, config: Config, logger: Logger) {
  const queue = startJobQueue(sequelize, backgroundJobs(sequelize, config.secrets.jwtSecret), {
    instance: config.FOURPOINT_INSTANCE,
    pollMs: config.JOB_POLL_MS,
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

function readConfig(): Config {
  try {
    return loadConfig();
  } catch (error) {
    if (error instanceof MissingSecretError || error instanceof ConfigError) fail(error.message);
    throw error;
  }
}

function main(): void {
  const config = readConfig();
  const { PORT: port, HOST: host } = config;
  const databaseUrl = config.DATABASE_URL;
  if (!databaseUrl)
    fail('DATABASE_URL is not set: run `npm start`, which sets up the database, or set it yourself.');
  const logger = pino({ level: config.LOG_LEVEL });
  // The composition root: every part is built here, once, from the configuration.
  replaceServices(composeServices(config));
  const sequelize = createSequelize(databaseUrl);
  // Behind the balancer each process is named by it (i1, i2...); alone, by its host and process id.
  const instance = config.FOURPOINT_INSTANCE;
  const app = createApp({
    sequelize,
    jwtSecret: config.secrets.jwtSecret,
    webDist: config.WEB_DIST,
    logger: logger.child({ instance }),
    instanceName: instance,
    // TRUST_PROXY=loopback when a balancer on this machine forwards the client's address (npm start sets it).
    trustProxy: config.TRUST_PROXY ?? false,
  });
  const jobs = startBackgroundWork(sequelize, config, logger);
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
    setTimeout(() => server.closeAllConnections(), config.SHUTDOWN_GRACE_MS).unref();
    Promise.all([requestsDone, jobs.stop()])
      .then(() => sequelize.close())
      .finally(() => process.exit(0));
  };
  process.on('SIGINT', () => close('SIGINT'));
  process.on('SIGTERM', () => close('SIGTERM'));
}

main();
