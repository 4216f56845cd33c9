import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import {
  reviewSessionPageSchema,
  type ReviewSessionPage,
  type ReviewSessionQuery,
} from '@/shared/protocol/review';

export const reviewSessionsKey = ['review-sessions'] as const;

export type SessionFilters = Omit<ReviewSessionQuery, 'cursor' | 'limit'>;

function params(
  filters: SessionFilters,
  cursor: string | null,
  limit: number,
): Record<string, string | number | boolean> {
  const out: Record<string, string | number | boolean> = { limit };
  for (const [k, v] of Object.entries(filters))
    if (v !== undefined && v !== null && v !== '') out[k] = v as string | number | boolean;
  if (cursor) out.cursor = cursor;
  return out;
}

export async function fetchReviewSessions(
  filters: SessionFilters,
  cursor: string | null,
  limit = 25,
): Promise<ReviewSessionPage> {
  return unwrap(
    await request(
      { method: 'GET', url: '/review/sessions', params: params(filters, cursor, limit) },
      reviewSessionPageSchema,
    ),
  );
}

/** One page of the review table; the previous page stays on screen while the next loads. */
export function useReviewSessionsQuery(filters: SessionFilters, cursor: string | null, limit = 25) {
  return useQuery({
    queryKey: [...reviewSessionsKey, filters, cursor, limit],
    queryFn: () => fetchReviewSessions(filters, cursor, limit),
    placeholderData: keepPreviousData,
  });
}
