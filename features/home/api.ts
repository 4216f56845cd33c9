import { useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { attentionSchema, followUpsDueResponseSchema } from '@/shared/protocol/practice';

/** What waits for a person; mutations that settle one of those things invalidate it. */
export const attentionKey = ['attention'] as const;

export function useAttentionQuery() {
  return useQuery({
    queryKey: attentionKey,
    refetchInterval: 60_000,
    queryFn: async () => unwrap(await request({ method: 'GET', url: '/admin/attention' }, attentionSchema)),
  });
}

export const followUpsKey = ['follow-ups'] as const;

export function useFollowUpsDueQuery(withinDays = 14) {
  return useQuery({
    queryKey: [...followUpsKey, withinDays],
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: '/follow-ups/due', params: { withinDays } },
          followUpsDueResponseSchema,
        ),
      ).due,
  });
}
