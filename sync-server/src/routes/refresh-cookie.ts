import type { CookieOptions, Request, Response } from 'express';
import type { SignInResponse } from '@/shared/protocol';
import { AppError } from '../errors';
import { REFRESH_TOKEN_TTL_MS } from '../services/tokens';
import type { IssuedTokens } from '../use-cases/auth';

/**
 * The web app's refresh token lives in this cookie, out of reach of page scripts (httpOnly), sent only to the
 * auth routes (path) and never on a request started by another site (SameSite=Strict), Secure over https.
 * OWASP ASVS 4.0.3 V3.4.1–V3.4.3 and V3.4.5.
 */
export const REFRESH_COOKIE = 'fourpoint_refresh';
export const REFRESH_COOKIE_PATH = '/api/auth';

const cookieOptions = (req: Request): CookieOptions => ({
  httpOnly: true,
  // Behind a proxy, `trust proxy` makes req.secure follow X-Forwarded-Proto.
  secure: req.secure,
  sameSite: 'strict',
  path: REFRESH_COOKIE_PATH,
});

/** The answer to sign-in or refresh: the refresh token in the cookie (and not the body) when asked for. */
export function sendTokens(req: Request, res: Response, tokens: IssuedTokens, inCookie: boolean): void {
  if (!inCookie) {
    const body: SignInResponse = tokens;
    res.json(body);
    return;
  }
  res.cookie(REFRESH_COOKIE, tokens.refreshToken, { ...cookieOptions(req), maxAge: REFRESH_TOKEN_TTL_MS });
  const body: SignInResponse = { accessToken: tokens.accessToken, user: tokens.user };
  res.json(body);
}

export function clearRefreshCookie(req: Request, res: Response): void {
  res.clearCookie(REFRESH_COOKIE, cookieOptions(req));
}

/**
 * The refresh token of a refresh or sign-out request: the body's (devices) or else the cookie's (web).
 * A cookie is sent by the browser on its own, so a request that relies on it must also be JSON: a form post
 * from another page cannot set that content type without a CORS preflight, which this server never grants.
 */
export function refreshTokenOf(
  req: Request,
  bodyToken: string | undefined,
): { token: string; via: 'body' | 'cookie' } | null {
  if (bodyToken) return { token: bodyToken, via: 'body' };
  const cookie = (req.cookies as Record<string, unknown> | undefined)?.[REFRESH_COOKIE];
  if (typeof cookie !== 'string' || cookie === '') return null;
  if (!req.is('application/json'))
    throw new AppError('json_required', 'Send this request as JSON (Content-Type: application/json).', 415);
  return { token: cookie, via: 'cookie' };
}
