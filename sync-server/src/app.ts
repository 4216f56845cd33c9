import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import pino, { type Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type { Services } from './composition-root';
import { AppError } from './errors';
import { contentSecurityPolicy } from './middleware/content-security-policy';
import { errorHandler } from './middleware/error-handler';
import { instanceName } from './middleware/instance-name';
import { refuseNulCharacters } from './middleware/refuse-nul';
import { useAuditDatabase } from './repositories/audit-repository';
import { DEFAULT_SIGN_IN_LIMITS, type SignInLimitOptions } from './middleware/rate-limits';
import { registerApiRoutes } from './routes/build-router';
import { serveWebExport } from './web-export';

export interface AppDeps {
  sequelize: Sequelize;
  jwtSecret: string;
  /** Built once by the composition root (main.ts; tests: makeTestContext) and handed to every route. */
  services: Services;
  /** Folder of the web export; when set, the app is served beside the API. */
  webDist?: string;
  logger?: Logger;
  signInLimits?: SignInLimitOptions;
  /**
   * Names this app's rate-limit counters in the database. Server processes with the same prefix count together
   * (the default); a test gives each app its own so they do not share counts.
   */
  rateLimitPrefix?: string;
  /** Express's `trust proxy`; leave unset unless a known proxy sits in front. */
  trustProxy?: boolean | number | string;
  /** Sent as `X-Fourpoint-Instance` on every API answer (FOURPOINT_INSTANCE; main.ts picks a default). */
  instanceName?: string;
}

export function createApp(deps: AppDeps): Express {
  useAuditDatabase(deps.sequelize);
  const logger = deps.logger ?? pino({ level: 'info' });
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.trustProxy ?? false);
  app.use(
    helmet({
      contentSecurityPolicy: contentSecurityPolicy(deps.webDist),
      crossOriginEmbedderPolicy: { policy: 'require-corp' },
      crossOriginOpenerPolicy: { policy: 'same-origin' },
      crossOriginResourcePolicy: { policy: 'same-origin' },
    }),
  );
  if (deps.instanceName) app.use('/api', instanceName(deps.instanceName));
  app.use('/api', express.json({ limit: '1mb' }), refuseNulCharacters);
  // Only the auth routes read cookies: the web app's refresh token (routes/refresh-cookie.ts).
  app.use('/api/auth', cookieParser());

  registerApiRoutes(
    app,
    { sequelize: deps.sequelize, jwtSecret: deps.jwtSecret, services: deps.services },
    {
      signInLimits: deps.signInLimits ?? DEFAULT_SIGN_IN_LIMITS,
      rateLimitPrefix: deps.rateLimitPrefix ?? 'app',
    },
  );
  app.use('/api', () => {
    throw new AppError('not_found', 'There is no such API route.', 404);
  });

  if (deps.webDist) serveWebExport(app, deps.webDist);

  app.use(errorHandler(logger));
  return app;
}
