import { z } from 'zod';
import { isCalendarDate, sessionStatusSchema, type Site } from '@/shared/protocol';
import {
  reviewSortSchema,
  type ReviewSessionPage,
  type ReviewSort,
  type reviewSessionQuerySchema,
} from '@/shared/protocol/review';
import { AppError } from '../../errors';
import { listReviewSessions, type ReferralLimits } from '../../repositories/review-repository';
import type { Caller, UseCaseDeps } from '../context';
import type { RangeLookup } from './measurements';
import { rangesForClinic } from './ranges';

type Query = z.output<typeof reviewSessionQuerySchema>;
const SITES: readonly Site[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

export function referralLimits(ranges: RangeLookup): ReferralLimits {
  const out = {} as ReferralLimits;
  for (const site of SITES) {
    const hr = ranges('heartRateBpm', site);
    out[site] = {
      hrLow: hr?.low ?? null,
      hrHigh: hr?.high ?? null,
      systolicLow: ranges('systolicActivity', site)?.low ?? null,
      systolicHigh: ranges('systolicActivity', site)?.high ?? null,
      diastolicLow: ranges('diastolicActivity', site)?.low ?? null,
      diastolicHigh: ranges('diastolicActivity', site)?.high ?? null,
    };
  }
  return out;
}

// The cursor carries the last row's sort value and id, so a page never repeats or skips a row when
// sessions arrive while someone is paging (keyset paging). It comes back from the client, so it is checked
// field by field against what the server writes before any of it reaches SQL.
const pgTimestamp =
  /^(\d{4}-\d{2}-\d{2}) ([01]\d|2[0-3]):[0-5]\d:[0-5]\d(\.\d{1,6})?[+-](0\d|1[0-5])(:[0-5]\d){0,2}$/;
const sortValueSchemas: Record<ReviewSort, z.ZodType<string>> = {
  // started_at::text in the session's ISO DateStyle, e.g. 2026-03-31 14:05:00.123+00
  startedAt: z.string().refine((v) => isCalendarDate(pgTimestamp.exec(v)?.[1] ?? '')),
  clientName: z.string().max(500),
  operatorName: z.string().max(500),
  status: sessionStatusSchema,
};
const cursorSchema = z.strictObject({
  s: reviewSortSchema,
  d: z.enum(['asc', 'desc']),
  v: z.string().refine((v) => !v.includes('\u0000')),
  id: z.uuid(),
});
type Cursor = z.infer<typeof cursorSchema>;
const encodeCursor = (c: Cursor) => Buffer.from(JSON.stringify(c)).toString('base64url');

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

function decodeCursor(raw: string, sort: ReviewSort, dir: string): Cursor {
  const parsed = cursorSchema.safeParse(parseJson(Buffer.from(raw, 'base64url').toString('utf8')));
  if (!parsed.success)
    throw new AppError(
      'bad_cursor',
      'This page link is not one the server gave; start again from the first page.',
      400,
    );
  const cursor = parsed.data;
  if (cursor.s !== sort || cursor.d !== dir || !sortValueSchemas[sort].safeParse(cursor.v).success) {
    throw new AppError(
      'bad_cursor',
      'This page link no longer matches the sort order; start again from the first page.',
      400,
    );
  }
  return cursor;
}

export async function listSessionsForReview(
  deps: UseCaseDeps,
  caller: Caller,
  query: Query,
): Promise<ReviewSessionPage> {
  if (query.from && query.to && query.from > query.to)
    throw new AppError('bad_date_range', 'The start date is after the end date.', 400);
  const after = query.cursor ? decodeCursor(query.cursor, query.sort, query.dir) : undefined;
  const limits = referralLimits(await rangesForClinic(deps.sequelize, caller.clinicId));
  const { rows, total, hasMore } = await listReviewSessions(
    deps.sequelize,
    caller.clinicId,
    {
      filter: {
        clientId: query.clientId,
        operatorId: query.operatorId,
        from: query.from,
        to: query.to,
        status: query.status,
        flagged: query.flagged,
        quality: query.quality,
        q: query.q || undefined,
      },
      sort: query.sort,
      dir: query.dir,
      limit: query.limit,
      after: after ? { value: after.v, id: after.id } : undefined,
    },
    limits,
  );
  const last = rows[rows.length - 1];
  return {
    sessions: rows.map(({ sortValue: _sortValue, ...row }) => row),
    total,
    nextCursor:
      hasMore && last ? encodeCursor({ s: query.sort, d: query.dir, v: last.sortValue, id: last.id }) : null,
  };
}
