import type { ReviewSessionPage } from '@/shared/protocol/review';
import type { reviewSessionQuerySchema } from '@/shared/protocol/review';
import type { z } from 'zod';
import type { Site } from '@/shared/protocol';
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
      systolicHigh: ranges('systolicActivity', site)?.high ?? null,
      diastolicHigh: ranges('diastolicActivity', site)?.high ?? null,
    };
  }
  return out;
}

// The cursor carries the last row's sort value and id, so a page never repeats or skips a row when
// sessions arrive while someone is paging (keyset paging).
type Cursor = { s: string; d: string; v: string; id: string };
const encodeCursor = (c: Cursor) => Buffer.from(JSON.stringify(c)).toString('base64url');
function decodeCursor(raw: string, sort: string, dir: string): Cursor {
  try {
    const c = JSON.parse(Buffer.from(raw, 'base64url').toString('utf8')) as Cursor;
    if (
      typeof c.v === 'string' &&
      typeof c.id === 'string' &&
      c.s === sort &&
      c.d === dir &&
      /^[0-9a-f-]{36}$/.test(c.id)
    )
      return c;
  } catch {
    /* fall through */
  }
  throw new AppError(
    'bad_cursor',
    'This page link no longer matches the sort order; start again from the first page.',
    400,
  );
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
