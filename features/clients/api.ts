import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { clientListResponseSchema, type ClientSummary } from '@/shared/protocol';

export const clientsKey = ['clients'] as const;

export async function fetchClients(q: string): Promise<ClientSummary[]> {
  const params = q.trim() ? { q: q.trim() } : undefined;
  const data = unwrap(await request({ method: 'GET', url: '/clients', params }, clientListResponseSchema));
  return data.clients;
}

export function useClientsQuery(q: string) {
  return useQuery({
    queryKey: [...clientsKey, { q: q.trim() }],
    queryFn: () => fetchClients(q),
    placeholderData: keepPreviousData,
  });
}
