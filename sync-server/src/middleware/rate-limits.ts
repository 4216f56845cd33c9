import type { RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { ApiError } from '@/shared/protocol';

export interface SignInLimitOptions {
  windowMs: number;
  /** Failed attempts allowed for one e-mail from one address in the window. */
  perAccountAndAddress: number;
  /** Failed attempts allowed from one address, whatever the e-mail. */
  perAddress: number;
}

export const DEFAULT_SIGN_IN_LIMITS: SignInLimitOptions = {
  windowMs: 15 * 60 * 1000,
  perAccountAndAddress: 10,
  perAddress: 50,
};

const tooMany = (windowMs: number): ApiError => ({
  error: {
    code: 'too_many_attempts',
    message: `Too many sign-in attempts. Wait ${Math.ceil(windowMs / 60_000)} minutes and try again.`,
  },
});

const emailOf = (body: unknown) => {
  const email = (body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? email.trim().toLowerCase() : '';
};

/** One limiter set per app, so each app (and each test) counts on its own. */
export function signInLimiters(options: SignInLimitOptions): RequestHandler[] {
  const common = {
    windowMs: options.windowMs,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    // Only failures count, so a person who signs in often is never locked out.
    skipSuccessfulRequests: true,
    handler: (_req: unknown, res: { status: (n: number) => { json: (b: unknown) => void } }) =>
      res.status(429).json(tooMany(options.windowMs)),
  };
  return [
    rateLimit({ ...common, limit: options.perAddress, keyGenerator: (req) => ipKeyGenerator(req.ip ?? '') }),
    rateLimit({
      ...common,
      limit: options.perAccountAndAddress,
      keyGenerator: (req) => `${emailOf(req.body)}|${ipKeyGenerator(req.ip ?? '')}`,
    }),
  ];
}
