import type { ErrorRequestHandler } from 'express';
import type { Logger } from 'pino';
import { BaseError, ConnectionError } from 'sequelize';
import { ZodError } from 'zod';
import type { ApiError } from '@/shared/protocol';
import { AppError } from '../errors';

/** Seconds a client should wait before trying again while the database is out of reach. */
export const DATABASE_RETRY_AFTER_S = 30;

const describeZod = (error: ZodError) =>
  error.issues
    .map((issue) => (issue.path.length ? `${issue.path.join('.')}: ${issue.message}` : issue.message))
    .join('; ');

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, req, res, _next) => {
    let status = 500;
    let body: ApiError = {
      error: { code: 'internal', message: 'Something went wrong on the server. Try again.' },
    };
    if (error instanceof AppError) {
      status = error.httpStatus;
      body = {
        error: {
          code: error.code,
          message: error.message,
          ...(error.details === undefined ? {} : { details: error.details }),
        },
      };
    } else if (error instanceof ZodError) {
      status = 400;
      body = { error: { code: 'validation_failed', message: describeZod(error), details: error.issues } };
    } else if (error instanceof URIError) {
      // Express decodes path parameters and throws this for a stray `%` (`/api/client-records/%zz`).
      status = 400;
      body = {
        error: {
          code: 'malformed_path',
          message: 'The address has a % that is not followed by two hex digits; encode it as %25.',
        },
      };
    } else if (isBodyParserError(error)) {
      status = error.status;
      body =
        error.type === 'entity.parse.failed'
          ? { error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } }
          : error.type === 'entity.too.large'
            ? { error: { code: 'payload_too_large', message: 'The request body is too large.' } }
            : { error: { code: 'bad_request', message: 'The request could not be read.' } };
    } else if (isDatabaseUnreachable(error)) {
      status = 503;
      res.setHeader('Retry-After', String(DATABASE_RETRY_AFTER_S));
      body = {
        error: {
          code: 'database_unavailable',
          message: `The clinic's database cannot be reached just now. Nothing was changed; try again in ${DATABASE_RETRY_AFTER_S} seconds.`,
        },
      };
    }
    if (status >= 500) logger.error({ err: error, method: req.method, path: req.path }, 'request failed');
    // An error may carry what was sent or what is stored (a stale note, a name): never cached.
    res.setHeader('Cache-Control', 'no-store');
    res.status(status).json(body);
  };
}

function isBodyParserError(error: unknown): error is { status: number; type: string } {
  const e = error as { status?: unknown; type?: unknown } | null;
  return typeof e?.status === 'number' && typeof e.type === 'string' && e.status >= 400 && e.status < 500;
}

// PostgreSQL SQLSTATEs meaning the server is not there for us (class 08 connection exception, 57P01..57P03
// shut down or starting, 53300 too many connections), and the socket errors of a peer that is gone.
const UNREACHABLE_CODES = new Set([
  '57P01',
  '57P02',
  '57P03',
  '53300',
  'ECONNREFUSED',
  'ECONNRESET',
  'EPIPE',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENOTFOUND',
]);
const UNREACHABLE_MESSAGE =
  /Connection terminated|connection (?:is )?(?:closed|ended)|Client has encountered a connection error/i;

/**
 * Sequelize's connection errors, or a Sequelize query error whose cause (pg's error, or Node's socket error
 * under it) is a lost link. Only Sequelize's errors count: a refused SMTP or S3 socket is not the database.
 */
export function isDatabaseUnreachable(error: unknown): boolean {
  if (error instanceof ConnectionError) return true;
  if (!(error instanceof BaseError)) return false;
  const { parent } = error as { parent?: { code?: unknown; message?: unknown } };
  if (!parent) return false;
  const code = typeof parent.code === 'string' ? parent.code : '';
  return (
    UNREACHABLE_CODES.has(code) ||
    /^08[0-9A-Z]{3}$/.test(code) ||
    (typeof parent.message === 'string' && UNREACHABLE_MESSAGE.test(parent.message))
  );
}
