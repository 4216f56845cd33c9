import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { auditListResponseSchema, type AuditQuery } from '@/shared/protocol/practice';

export const auditKey = ['audit'] as const;

export function useAuditQuery(query: AuditQuery) {
  return useQuery({
    queryKey: [...auditKey, query],
    placeholderData: keepPreviousData,
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: '/audit', params: query }, auditListResponseSchema)),
  });
}
