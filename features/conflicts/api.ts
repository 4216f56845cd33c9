import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { attentionKey } from '@/features/home/api';
import { reviewRootKey, reviewSessionsKey } from '@/features/review/api';
import {
  conflictDetailResponseSchema,
  conflictListResponseSchema,
  resolveConflictResponseSchema,
  type ResolveConflictRequest,
} from '@/shared/protocol/sync';

export type ConflictStatusFilter = 'open' | 'resolved' | 'all';

export const conflictsKey = ['conflicts'] as const;
export const conflictListKey = (status: ConflictStatusFilter) => [...conflictsKey, 'list', status] as const;
export const conflictDetailKey = (id: string) => [...conflictsKey, 'detail', id] as const;

export function useConflictListQuery(status: ConflictStatusFilter = 'open') {
  return useQuery({
    queryKey: conflictListKey(status),
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: '/admin/conflicts', params: { status } },
          conflictListResponseSchema,
        ),
      ).conflicts,
  });
}

export function useConflictQuery(id: string) {
  return useQuery({
    queryKey: conflictDetailKey(id),
    enabled: Boolean(id),
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: `/admin/conflicts/${id}` }, conflictDetailResponseSchema))
        .conflict,
  });
}

/** A resolution closes the conflict and writes a new version of the row, so lists and reviews of it move too. */
export function useResolveConflictMutation(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: ResolveConflictRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: `/admin/conflicts/${id}/resolve`, data: input },
          resolveConflictResponseSchema,
        ),
      ),
    onSuccess: async (answer) => {
      qc.setQueryData(conflictDetailKey(id), answer.conflict);
      await Promise.all([
        qc.invalidateQueries({ queryKey: conflictsKey }),
        qc.invalidateQueries({ queryKey: reviewSessionsKey }),
        qc.invalidateQueries({ queryKey: reviewRootKey }),
        qc.invalidateQueries({ queryKey: attentionKey }),
      ]);
    },
  });
}
