import { z } from 'zod';
import { request } from '@/hooks/api/client';
import type { ApiResult } from '@/hooks/api/result';
import { signInResponseSchema, type SignInRequest, type SignInResponse } from '@/shared/protocol';

export function postSignIn(body: SignInRequest): Promise<ApiResult<SignInResponse>> {
  return request({ method: 'POST', url: '/auth/sign-in', data: body }, signInResponseSchema);
}

export function postSignOut(refreshToken: string, accessToken: string): Promise<ApiResult<unknown>> {
  return request(
    {
      method: 'POST',
      url: '/auth/sign-out',
      data: { refreshToken },
      headers: { Authorization: `Bearer ${accessToken}` },
      timeout: 5_000,
    },
    z.unknown(),
  );
}
