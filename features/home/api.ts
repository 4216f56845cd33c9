import { useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { attentionSchema } from '@/shared/protocol/practice';

export function useAttentionQuery() {
  return useQuery({
    queryKey: ['admin', 'attention'],
    refetchInterval: 60_000,
    queryFn: async () => unwrap(await request({ method: 'GET', url: '/admin/attention' }, attentionSchema)),
  });
}
