import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import {
  invitationAcceptedSchema,
  invitationPreviewSchema,
  invitationSchema,
  teamResponseSchema,
  teamUserSchema,
  type AcceptInvitationRequest,
  type InviteRequest,
  type UpdateTeamUserRequest,
} from '@/shared/protocol/practice';

export const teamKey = ['team'] as const;

export function useTeamQuery() {
  return useQuery({
    queryKey: teamKey,
    queryFn: async () => unwrap(await request({ method: 'GET', url: '/team' }, teamResponseSchema)),
  });
}

export function useInviteMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: InviteRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: '/team/invitations', data: input },
          z.object({ invitation: invitationSchema, emailed: z.boolean() }),
        ),
      ),
    onSuccess: () => qc.invalidateQueries({ queryKey: teamKey }),
  });
}

export function useRevokeInvitationMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (id: string) =>
      unwrap(await request({ method: 'DELETE', url: `/team/invitations/${id}` }, z.any())),
    onSuccess: () => qc.invalidateQueries({ queryKey: teamKey }),
  });
}

export function useUpdateTeamUserMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ id, change }: { id: string; change: UpdateTeamUserRequest }) =>
      unwrap(
        await request(
          { method: 'PATCH', url: `/team/users/${id}`, data: change },
          z.object({ user: teamUserSchema }),
        ),
      ).user,
    onSuccess: () => qc.invalidateQueries({ queryKey: teamKey }),
  });
}

export function useInvitationPreviewQuery(token: string) {
  return useQuery({
    queryKey: ['invitation', token],
    retry: false,
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: `/invitations/${encodeURIComponent(token)}` },
          invitationPreviewSchema,
        ),
      ),
  });
}

export function useAcceptInvitationMutation(token: string) {
  return useMutation({
    mutationFn: async (input: AcceptInvitationRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: `/invitations/${encodeURIComponent(token)}/accept`, data: input },
          invitationAcceptedSchema,
        ),
      ),
  });
}
