import { useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { followUpsDueResponseSchema } from '@/shared/protocol/practice';

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
