import type { Request, RequestHandler, Response } from 'express';
import {
  ipKeyGenerator,
  rateLimit,
  type AugmentedRequest,
  type ClientRateLimitInfo,
  type Options,
  type Store,
} from 'express-rate-limit';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { ApiError } from '@/shared/protocol';
import { normaliseEmail } from '../repositories/users-repository';

export interface SignInLimitOptions {
  windowMs: number;
  /**
   * Failed attempts allowed for one account (normalised e-mail) in the window, from all addresses together,
   * so spreading guesses over many addresses gains nothing (OWASP ASVS 4.0.3 V2.2.1). Only failures count and
   * the block lifts when the window ends: a soft lock that an attacker can prolong but not make permanent.
   */
  perAccount: number;
  /** Failed attempts allowed from one address, whatever the e-mail (one address trying many accounts). */
  perAddress: number;
}

export const DEFAULT_SIGN_IN_LIMITS: SignInLimitOptions = {
  windowMs: 15 * 60 * 1000,
  perAccount: 10,
  perAddress: 50,
};

/**
 * express-rate-limit's store over a PostgreSQL table, so every server process on the database counts together.
 * A counter is one row: the first hit after its window ended starts a new window.
 */
export class PostgresRateLimitStore implements Store {
  readonly localKeys = false;
  private windowMs = DEFAULT_SIGN_IN_LIMITS.windowMs;

  /** `prefix` keeps this limiter's counters apart from other limiters' on the same table. */
  constructor(
    private readonly sequelize: Sequelize,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private async one(sql: string, key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows = await this.sequelize.query<{ hits: number; resets_at: Date }>(sql, {
      replacements: { key: `${this.prefix}:${key}`, windowMs: this.windowMs },
      type: QueryTypes.SELECT,
    });
    return rows[0] ? { totalHits: rows[0].hits, resetTime: new Date(rows[0].resets_at) } : undefined;
  }

  get(key: string): Promise<ClientRateLimitInfo | undefined> {
    return this.one(
      `SELECT hits, resets_at FROM rate_limit_hits WHERE key = :key AND resets_at > now()`,
      key,
    );
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const info = await this.one(
      `INSERT INTO rate_limit_hits AS r (key, hits, resets_at)
       VALUES (:key, 1, now() + :windowMs * interval '1 millisecond')
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN r.resets_at <= now() THEN 1 ELSE r.hits + 1 END,
         resets_at = CASE WHEN r.resets_at <= now() THEN EXCLUDED.resets_at ELSE r.resets_at END
       RETURNING hits, resets_at`,
      key,
    );
    return info!;
  }

  async decrement(key: string): Promise<void> {
    await this.one(
      `UPDATE rate_limit_hits SET hits = GREATEST(hits - 1, 0) WHERE key = :key AND resets_at > now()
       RETURNING hits, resets_at`,
      key,
    );
  }

  async resetKey(key: string): Promise<void> {
    await this.one(`DELETE FROM rate_limit_hits WHERE key = :key RETURNING hits, resets_at`, key);
  }
}

function tooMany(resetTime: Date | undefined, windowMs: number, what = 'sign-in attempts'): ApiError {
  const waitMs = resetTime ? resetTime.getTime() - Date.now() : windowMs;
  const minutes = Math.max(1, Math.ceil(waitMs / 60_000));
  return {
    error: {
      code: 'too_many_attempts',
      message: `Too many ${what}. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`,
    },
  };
}

const emailOf = (body: unknown) => {
  const email = (body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? normaliseEmail(email) : '';
};

/**
 * The sign-in limiters of one app. Apps with the same `keyPrefix` on the same database share their counts
 * (several server processes); tests give each app its own prefix.
 */
export function signInLimiters(
  options: SignInLimitOptions,
  sequelize: Sequelize,
  keyPrefix: string,
): RequestHandler[] {
  const common = {
    windowMs: options.windowMs,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    // Only failures count, so a person who signs in often is never locked out.
    skipSuccessfulRequests: true,
    // express-rate-limit sets Retry-After (seconds) before calling this.
    handler: (req: Request, res: Response) =>
      res.status(429).json(tooMany((req as AugmentedRequest).rateLimit.resetTime, options.windowMs)),
  };
  return [
    rateLimit({
      ...common,
      limit: options.perAddress,
      store: new PostgresRateLimitStore(sequelize, `${keyPrefix}:address`),
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    }),
    rateLimit({
      ...common,
      limit: options.perAccount,
      store: new PostgresRateLimitStore(sequelize, `${keyPrefix}:account`),
      keyGenerator: (req) => emailOf(req.body),
      // A request without an e-mail (accepting an invitation) is for no account; the address limit covers it.
      skip: (req) => emailOf(req.body) === '',
    }),
  ];
}

/**
 * Password-reset requests: every request counts (not only failures), per address asked for and per caller's
 * address, so nobody can flood a mailbox or walk the list of addresses. The answer is the same whether or not
 * the address has an account, the limit included.
 */
export const PASSWORD_RESET_LIMITS = { windowMs: 60 * 60 * 1000, perAccount: 3, perAddress: 20 } as const;

export function passwordResetLimiters(sequelize: Sequelize, keyPrefix: string): RequestHandler[] {
  const { windowMs, perAccount, perAddress } = PASSWORD_RESET_LIMITS;
  const common = {
    windowMs,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    handler: (req: Request, res: Response) =>
      res
        .status(429)
        .json(
          tooMany((req as AugmentedRequest).rateLimit.resetTime, windowMs, 'requests for a new password'),
        ),
  };
  return [
    rateLimit({
      ...common,
      limit: perAddress,
      store: new PostgresRateLimitStore(sequelize, `${keyPrefix}:address`),
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    }),
    rateLimit({
      ...common,
      limit: perAccount,
      store: new PostgresRateLimitStore(sequelize, `${keyPrefix}:account`),
      keyGenerator: (req) => emailOf(req.body),
      skip: (req) => emailOf(req.body) === '',
    }),
  ];
}
