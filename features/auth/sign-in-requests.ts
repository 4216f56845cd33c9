import { Platform } from 'react-native';
import { z } from 'zod';
import { request } from '@/api/client';
import type { ApiResult } from '@/api/result';
// The auth schemas alone: the '@/shared/protocol' barrel would build every API schema before sign-in can paint.
import {
  signInResponseSchema,
  type RefreshTokenIn,
  type SignInRequest,
  type SignInResponse,
} from '@/shared/protocol/auth';

/**
 * In a browser the refresh token stays in an httpOnly cookie that page scripts cannot read; a phone keeps it
 * in its own storage and gets it in the body.
 */
export const refreshTokenIn: RefreshTokenIn = Platform.OS === 'web' ? 'cookie' : 'body';

export function postSignIn(body: SignInRequest): Promise<ApiResult<SignInResponse>> {
  return request(
    { method: 'POST', url: '/auth/sign-in', data: { ...body, refreshTokenIn } },
    signInResponseSchema,
  );
}

/** Ends the sign-in on the server: the refresh token (or the web's cookie) and its access tokens. */
export function postSignOut(
  refreshToken: string | undefined,
  accessToken: string,
): Promise<ApiResult<unknown>> {
  return request(
    {
      method: 'POST',
      url: '/auth/sign-out',
      data: refreshToken ? { refreshToken } : {},
      headers: { Authorization: `Bearer ${accessToken}` },
      timeout: 5_000,
    },
    z.unknown(),
  );
}
