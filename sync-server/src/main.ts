import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { createApp } from './app';
import { MissingSecretError, readSecrets, type Secrets } from './config/secrets';
import { createSequelize } from './db/database';
import { startFollowUpReminderJob } from './jobs/follow-up-reminders';
import { startReportMailRetryJob } from './jobs/report-mail-retries';
import { practiceServices } from './services/practice-services';
import { syncServicesFor } from './services/sync-services';
import { purgeErased } from './use-cases/clients/erase-client';
import { reviewServices } from './use-cases/review/services';

const logger = pino({ level: process.env.LOG_LEVEL ?? 'info' });

function fail(message: string): never {
  console.error(message);
  process.exit(1);
}

const REMINDER_INTERVAL_MS = 10 * 60 * 1000;
const PURGE_INTERVAL_MS = 6 * 60 * 60 * 1000;
const REPORT_MAIL_RETRY_INTERVAL_MS = 60 * 1000;

/** Follow-up reminders, report e-mail retries and the purge of erased clients run in the server process, on timers. */
function startBackgroundJobs(sequelize: ReturnType<typeof createSequelize>, jwtSecret: string) {
  const reminders = startFollowUpReminderJob(
    sequelize,
    practiceServices().mail,
    REMINDER_INTERVAL_MS,
    (error) => logger.warn({ err: error }, 'follow-up reminder run failed; the next run retries'),
  );
  const mailRetries = startReportMailRetryJob(
    sequelize,
    () => reviewServices().mail,
    REPORT_MAIL_RETRY_INTERVAL_MS,
    (error) => logger.warn({ err: error }, 'report e-mail retry run failed; the next run retries'),
  );
  const purge = setInterval(() => {
    purgeErased({ sequelize, jwtSecret }).catch((error) =>
      logger.warn({ err: error }, 'purge of erased clients failed'),
    );
  }, PURGE_INTERVAL_MS);
  purge.unref();
  // The server may have died between an upload's last byte and its processing: those clips are processed now.
  syncServicesFor(sequelize)
    .uploads.processStaged()
    .then(
      (counts) => logger.info(counts, 'staged uploads processed at start-up'),
      (error) => logger.warn({ err: error }, 'staged uploads could not be processed at start-up'),
    );
  return { stop: () => (reminders.stop(), mailRetries.stop(), clearInterval(purge)) };
}

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
  const backgroundJobs = startBackgroundJobs(sequelize, secrets.jwtSecret);
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

  let closing = false;
  const close = (signal: string) => {
    if (closing) return;
    closing = true;
    logger.info({ signal }, 'stopping');
    backgroundJobs.stop();
    server.close(() => {
      sequelize.close().finally(() => process.exit(0));
    });
    server.closeIdleConnections();
    // Requests still open after a few seconds are cut, so Ctrl-C never hangs.
    setTimeout(() => {
      server.closeAllConnections();
    }, 3000).unref();
  };
  process.on('SIGINT', () => close('SIGINT'));
  process.on('SIGTERM', () => close('SIGTERM'));
}

main();
