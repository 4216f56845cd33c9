import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { AppError } from '../errors';

// One answer for a path that names a row in a form no row can have (400, here, before any handler), and one for a
// well-formed name no row of the caller's clinic carries (404, from the use case, the same as another clinic's).
// Every path parameter named `id` or `…Id` names a row by its UUID, unless the route lists it as opaque.

const uuid = z.uuid();

/** What a parameter names, in words, from its own name or from the path segment before `:id`. */
const NOUNS: Record<string, string> = {
  sessionId: 'session',
  otherId: 'session',
  clientId: 'client',
  mailId: 'report e-mail',
  messageId: 'message',
  'client-records': 'client',
  conflicts: 'conflict',
  invitations: 'invitation',
  users: 'team member',
  payments: 'payment',
};

export type RowIdParam = { name: string; noun: string };

/** The row-naming parameters of a route path (`/api/review/sessions/:sessionId` → sessionId, a session). */
export function rowIdParams(path: string, opaque: readonly string[] = []): RowIdParam[] {
  const segments = path.split('/');
  return segments.flatMap((segment, i) => {
    const name = segment.startsWith(':') ? segment.slice(1) : null;
    if (!name || opaque.includes(name) || !(name === 'id' || /^[a-z]+Id$/.test(name))) return [];
    return [{ name, noun: NOUNS[name] ?? NOUNS[segments[i - 1] ?? ''] ?? 'record' }];
  });
}

export const malformedRowId = (noun: string) =>
  new AppError(
    'malformed_id',
    `This link does not lead to a ${noun}: it is incomplete or mistyped. Open the ${noun} again from its list.`,
    400,
  );

/** Refuses a request whose path names a row in a form no row has; null when the route names no row. */
export function checkRowIds(path: string, opaque: readonly string[] = []): RequestHandler | null {
  const params = rowIdParams(path, opaque);
  if (!params.length) return null;
  return (req, _res, next) => {
    const bad = params.find((p) => !uuid.safeParse(req.params[p.name]).success);
    next(bad ? malformedRowId(bad.noun) : undefined);
  };
}

/** A row-naming path parameter, already checked by `checkRowIds` for every route of the access table. */
export const rowId = (req: Request, name = 'id'): string => String(req.params[name]);
