import express, { type Express } from 'express';
import helmet from 'helmet';
import pino, { type Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import { AppError } from './errors';
import { errorHandler } from './middleware/error-handler';
import { DEFAULT_SIGN_IN_LIMITS, type SignInLimitOptions } from './middleware/rate-limits';
import { initModels } from './models';
import { registerApiRoutes } from './routes/build-router';
import { serveWebExport } from './web-export';

export interface AppDeps {
  sequelize: Sequelize;
  jwtSecret: string;
  /** Folder of the web export; when set, the app is served beside the API. */
  webDist?: string;
  logger?: Logger;
  signInLimits?: SignInLimitOptions;
  /** Express's `trust proxy`; leave unset unless a known proxy sits in front. */
  trustProxy?: boolean | number | string;
}

export function createApp(deps: AppDeps): Express {
  initModels(deps.sequelize);
  const logger = deps.logger ?? pino({ level: 'info' });
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.trustProxy ?? false);
  app.use(
    helmet({
      // The web export's bundles are not written for a CSP yet.
      contentSecurityPolicy: false,
      crossOriginEmbedderPolicy: { policy: 'require-corp' },
      crossOriginOpenerPolicy: { policy: 'same-origin' },
      crossOriginResourcePolicy: { policy: 'same-origin' },
    }),
  );
  app.use('/api', express.json({ limit: '1mb' }));

  registerApiRoutes(
    app,
    { sequelize: deps.sequelize, jwtSecret: deps.jwtSecret },
    { signInLimits: deps.signInLimits ?? DEFAULT_SIGN_IN_LIMITS },
  );
  app.use('/api', () => {
    throw new AppError('not_found', 'There is no such API route.', 404);
  });

  if (deps.webDist) serveWebExport(app, deps.webDist);

  app.use(errorHandler(logger));
  return app;
}
