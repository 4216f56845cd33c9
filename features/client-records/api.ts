import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, request } from '@/api/client';
import { ApiFailure, failureFromError, unwrap } from '@/api/result';
import { attentionKey } from '@/features/home/api';
import {
  clientRecordSchema,
  clientTableResponseSchema,
  eraseClientResponseSchema,
  type ClientTableRequest,
  type UpdateClientRequest,
} from '@/shared/protocol/practice';

export const clientRecordsKey = ['client-records'] as const;

export function useClientTableQuery(query: ClientTableRequest) {
  return useQuery({
    queryKey: [...clientRecordsKey, 'table', query],
    placeholderData: keepPreviousData,
    queryFn: async () =>
      unwrap(
        await request({ method: 'GET', url: '/client-records', params: query }, clientTableResponseSchema),
      ),
  });
}

export function useClientRecordQuery(id: string) {
  return useQuery({
    queryKey: [...clientRecordsKey, id],
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: `/client-records/${id}` }, clientRecordSchema)),
  });
}

export function useUpdateClientMutation(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: UpdateClientRequest) =>
      unwrap(
        await request({ method: 'PATCH', url: `/client-records/${id}`, data: input }, clientRecordSchema),
      ),
    onSuccess: () => qc.invalidateQueries({ queryKey: clientRecordsKey }),
  });
}

export function useEraseClientMutation(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (confirmName: string) =>
      unwrap(
        await request(
          { method: 'POST', url: `/client-records/${id}/erase`, data: { confirmName } },
          eraseClientResponseSchema,
        ),
      ),
    // An erased client leaves "past retention" on the admin's overview.
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: clientRecordsKey }),
        qc.invalidateQueries({ queryKey: attentionKey }),
      ]),
  });
}

/** Downloads the export zip through the signed-in client and hands it to the browser. */
export async function downloadClientExport(id: string): Promise<void> {
  try {
    const response = await api.get(`/client-records/${id}/export`, {
      responseType: 'blob',
      timeout: 120_000,
    });
    const disposition = String(response.headers['content-disposition'] ?? '');
    const name = /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'fourpoint-export.zip';
    const url = URL.createObjectURL(response.data as Blob);
    const link = document.createElement('a');
    link.href = url;
    link.download = name;
    document.body.appendChild(link);
    link.click();
    link.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
  } catch (error) {
    throw new ApiFailure(failureFromError(error));
  }
}
