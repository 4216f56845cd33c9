import { useQuery } from '@tanstack/react-query';
import { request } from '@/hooks/api/client';
import { unwrap } from '@/hooks/api/result';
import { sessionListResponseSchema, type SessionSummary } from '@/shared/protocol';

export const sessionsKey = ['sessions'] as const;

export async function fetchSessions(): Promise<SessionSummary[]> {
  const data = unwrap(await request({ method: 'GET', url: '/sessions' }, sessionListResponseSchema));
  return data.sessions;
}

export function useSessionsQuery() {
  return useQuery({ queryKey: sessionsKey, queryFn: fetchSessions });
}
