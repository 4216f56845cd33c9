import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { Sequelize } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { forbidden, unauthenticated } from '../errors';
import { findUserForAccessToken } from '../repositories/users-repository';
import { verifyAccessToken } from '../services/tokens';
import { accountDisabled } from '../use-cases/auth';
import type { Caller } from '../use-cases/context';

const callers = new WeakMap<Request, Caller>();

/** The caller of a route behind `authenticate`; calling it elsewhere is a programming error. */
export function callerOf(req: Request): Caller {
  const caller = callers.get(req);
  if (!caller) throw new Error('callerOf() used on a route without authentication');
  return caller;
}

export function authenticate(deps: { sequelize: Sequelize; jwtSecret: string }): RequestHandler {
  return async (req: Request, _res: Response, next: NextFunction) => {
    const match = /^Bearer\s+(\S+)$/i.exec(req.get('authorization') ?? '');
    if (!match) throw unauthenticated();
    const claims = verifyAccessToken(match[1], deps.jwtSecret);
    if (!claims) throw unauthenticated('Your sign-in has expired or is not valid. Sign in again.');
    // The rows, not the token, decide: signing out, a disabled user or a changed role take effect on the next
    // request (OWASP ASVS 4.0.3 V3.3.1: sign-out invalidates the session).
    const user = await findUserForAccessToken(
      deps.sequelize,
      claims.clinicId,
      claims.userId,
      claims.sessionId,
    );
    if (!user) throw unauthenticated('Your sign-in has expired or is not valid. Sign in again.');
    if (user.disabled) throw accountDisabled();
    callers.set(req, { userId: user.id, role: user.role, clinicId: user.clinicId, ip: req.ip ?? null });
    next();
  };
}

export function requireRole(roles: readonly Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!roles.includes(callerOf(req).role)) throw forbidden();
    next();
  };
}
