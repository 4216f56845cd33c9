import fs from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import pino, { type Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import { AppError } from './errors';
import { contentSecurityPolicy } from './middleware/content-security-policy';
import { errorHandler } from './middleware/error-handler';
import { refuseNulCharacters } from './middleware/refuse-nul';
import { DEFAULT_SIGN_IN_LIMITS, type SignInLimitOptions } from './middleware/rate-limits';
import { initModels } from './models';
import { registerApiRoutes } from './routes/build-router';

export interface AppDeps {
  sequelize: Sequelize;
  jwtSecret: string;
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
}

// Cross-origin isolation lets the web app's SQLite use SharedArrayBuffer (see STACK.md).
const isolationHeaders = {
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Embedder-Policy': 'require-corp',
  'Cross-Origin-Resource-Policy': 'same-origin',
} as const;

export function createApp(deps: AppDeps): Express {
  initModels(deps.sequelize);
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
  app.use('/api', express.json({ limit: '1mb' }), refuseNulCharacters);
  // Only the auth routes read cookies: the web app's refresh token (routes/refresh-cookie.ts).
  app.use('/api/auth', cookieParser());

  registerApiRoutes(
    app,
    { sequelize: deps.sequelize, jwtSecret: deps.jwtSecret },
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

function serveWebExport(app: Express, webDist: string): void {
  const root = path.resolve(webDist);
  const indexHtml = path.join(root, 'index.html');
  app.use(
    express.static(root, {
      index: 'index.html',
      setHeaders: (res, filePath) => {
        for (const [name, value] of Object.entries(isolationHeaders)) res.setHeader(name, value);
        if (filePath.endsWith('.wasm')) res.setHeader('Content-Type', 'application/wasm');
        if (filePath.endsWith('index.html') || filePath.endsWith('sw.js'))
          res.setHeader('Cache-Control', 'no-cache');
      },
    }),
  );
  app.get('/{*splat}', (req, res, next) => {
    // A missing file (it has an extension) is a 404, not the app shell.
    if (req.path.startsWith('/api/') || path.extname(req.path) !== '' || !fs.existsSync(indexHtml)) {
      next(new AppError('not_found', 'Not found.', 404));
      return;
    }
    for (const [name, value] of Object.entries(isolationHeaders)) res.setHeader(name, value);
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });
}
