import type { ErrorRequestHandler } from 'express';
import type { Logger } from 'pino';
import { ZodError } from 'zod';
import type { ApiError } from '@/shared/protocol';
import { AppError } from '../errors';

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
    } else if (isBodyParserError(error)) {
      status = error.status;
      body =
        error.type === 'entity.parse.failed'
          ? { error: { code: 'malformed_json', message: 'The request body is not valid JSON.' } }
          : error.type === 'entity.too.large'
            ? { error: { code: 'payload_too_large', message: 'The request body is too large.' } }
            : { error: { code: 'bad_request', message: 'The request could not be read.' } };
    }
    if (status >= 500) logger.error({ err: error, method: req.method, path: req.path }, 'request failed');
    res.status(status).json(body);
  };
}

function isBodyParserError(error: unknown): error is { status: number; type: string } {
  const e = error as { status?: unknown; type?: unknown } | null;
  return typeof e?.status === 'number' && typeof e.type === 'string' && e.status >= 400 && e.status < 500;
}
