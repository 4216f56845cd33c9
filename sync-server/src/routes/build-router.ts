import type { Express, RequestHandler } from 'express';
import { authenticate, requireRole } from '../middleware/authenticate';
import { passwordResetLimiters, signInLimiters, type SignInLimitOptions } from '../middleware/rate-limits';
import type { UseCaseDeps } from '../use-cases/context';
import { accessTable, type RouteSpec } from './access-table';
import { checkRowIds } from './row-ids';

const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('Cache-Control', 'no-store');
  next();
};

export function registerApiRoutes(
  app: Express,
  deps: UseCaseDeps,
  options: { signInLimits: SignInLimitOptions; rateLimitPrefix: string },
  table: readonly RouteSpec[] = accessTable,
): void {
  const limits = {
    'sign-in': signInLimiters(options.signInLimits, deps.sequelize, `${options.rateLimitPrefix}:sign-in`),
    'password-reset': passwordResetLimiters(deps.sequelize, `${options.rateLimitPrefix}:password-reset`),
  };
  for (const route of table) {
    // Answers carry health records, traces and tokens: no browser or proxy keeps a copy.
    const chain: RequestHandler[] = [noStore];
    if (route.limit) chain.push(...limits[route.limit]);
    if (route.access !== 'public') chain.push(authenticate(deps), requireRole(route.access));
    const rowIds = checkRowIds(route.path, route.opaqueParams);
    if (rowIds) chain.push(rowIds);
    chain.push(route.handler(deps));
    app[route.method](route.path, ...chain);
  }
}
