import { useMutation, useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import {
  passwordResetPreviewSchema,
  passwordResetRequestedSchema,
  type CompletePasswordResetRequest,
  type PasswordResetRequest,
} from '@/shared/protocol';

export function useRequestPasswordResetMutation() {
  return useMutation({
    mutationFn: async (input: PasswordResetRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: '/auth/password-reset', data: input },
          passwordResetRequestedSchema,
        ),
      ),
  });
}

export function usePasswordResetPreviewQuery(token: string) {
  return useQuery({
    queryKey: ['password-reset', token],
    retry: false,
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: `/auth/password-reset/${encodeURIComponent(token)}` },
          passwordResetPreviewSchema,
        ),
      ),
  });
}

export function useCompletePasswordResetMutation(token: string) {
  return useMutation({
    mutationFn: async (input: CompletePasswordResetRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: `/auth/password-reset/${encodeURIComponent(token)}`, data: input },
          passwordResetRequestedSchema,
        ),
      ),
  });
}
