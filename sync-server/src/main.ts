import pino from 'pino';
import { createApp } from './app';
import { composeServices, startBackgroundWork } from './composition-root';
import { MissingSecretError } from './config/secrets';
import { ConfigError, loadConfig, type Config } from './config/settings';
import { createSequelize } from './db/database';
import { markStopping } from './lifecycle';

function fail(message: string): never {
  console.error(message);
  process.exit(1);
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
  // Behind the balancer each process is named by it (i1, i2...); alone, by its host and process id.
  const instance = config.FOURPOINT_INSTANCE;
  const sequelize = createSequelize(databaseUrl, { applicationName: `fourpoint ${instance}` });
  // The composition root: every part is built here, once, from the configuration, and handed to the app and jobs.
  const services = composeServices(config, sequelize);
  const app = createApp({
    sequelize,
    jwtSecret: config.secrets.jwtSecret,
    services,
    webDist: config.WEB_DIST,
    logger: logger.child({ instance }),
    instanceName: instance,
    // TRUST_PROXY=loopback when a balancer on this machine forwards the client's address (npm start sets it).
    trustProxy: config.TRUST_PROXY ?? false,
  });
  // Reminders, report-mail retries, the erasure purge and staged uploads: jobs on pg-boss, once across instances.
  const jobs = startBackgroundWork(sequelize, services, (job, error) =>
    logger.warn({ err: error, job }, 'background job failed; it is retried later'),
  ).catch((error: unknown) => {
    logger.error({ err: error }, 'the job queue could not start; background work waits for a restart');
    return null;
  });
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
    Promise.all([requestsDone, jobs.then((queue) => queue?.stop(config.SHUTDOWN_GRACE_MS))])
      .then(() => Promise.all([sequelize.close(), services.readiness.stop()]))
      .finally(() => process.exit(0));
  };
  process.on('SIGINT', () => close('SIGINT'));
  process.on('SIGTERM', () => close('SIGTERM'));
}

main();
