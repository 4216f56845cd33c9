import axios, { type AxiosRequestConfig, type InternalAxiosRequestConfig } from 'axios';
import type { z } from 'zod';
// The auth schemas alone: the '@/shared/protocol' barrel would build every API schema before sign-in can paint.
import { refreshResponseSchema, type SignInResponse } from '@/shared/protocol/auth';
import { failureFromError, type ApiResult } from './result';

export const apiBaseUrl = '/api';
const timeoutMs = 15_000;

type SessionBridge = {
  get: () => SignInResponse | null;
  onRefreshed: (session: SignInResponse) => void;
  onExpired: () => void;
};

let bridge: SessionBridge = { get: () => null, onRefreshed: () => undefined, onExpired: () => undefined };

/** The auth provider connects its session here, so the client reads tokens without React. */
export function connectSession(next: SessionBridge): void {
  bridge = next;
}

export const api = axios.create({ baseURL: apiBaseUrl, timeout: timeoutMs });
// A bare instance for the refresh call itself, so it never loops through the 401 handler.
export const refreshClient = axios.create({ baseURL: apiBaseUrl, timeout: timeoutMs });

const noRefreshPaths = ['/auth/sign-in', '/auth/refresh', '/auth/sign-out'];

api.interceptors.request.use((config) => {
  const token = bridge.get()?.accessToken;
  if (token && !config.headers.Authorization) config.headers.Authorization = `Bearer ${token}`;
  return config;
});

let refreshing: Promise<SignInResponse | null> | null = null;

async function refreshOnce(): Promise<SignInResponse | null> {
  const current = bridge.get();
  if (!current) return null;
  try {
    const response = await refreshClient.post('/auth/refresh', { refreshToken: current.refreshToken });
    const parsed = refreshResponseSchema.safeParse(response.data);
    if (!parsed.success) return null;
    bridge.onRefreshed(parsed.data);
    return parsed.data;
  } catch (error) {
    // Offline is not an expired sign-in: keep the session and let the caller see "offline".
    if (axios.isAxiosError(error) && !error.response) throw error;
    return null;
  }
}

type RetriableConfig = InternalAxiosRequestConfig & { fourpointRetried?: boolean };

api.interceptors.response.use(undefined, async (error: unknown) => {
  if (!axios.isAxiosError(error) || error.response?.status !== 401 || !error.config) throw error;
  const config = error.config as RetriableConfig;
  if (config.fourpointRetried || noRefreshPaths.some((p) => config.url?.startsWith(p))) throw error;
  refreshing ??= refreshOnce().finally(() => {
    refreshing = null;
  });
  const session = await refreshing;
  if (!session) {
    bridge.onExpired();
    throw error;
  }
  config.fourpointRetried = true;
  config.headers.Authorization = `Bearer ${session.accessToken}`;
  return api.request(config);
});

/** One request, answered as a typed result; the body is checked against the protocol schema. */
export async function request<S extends z.ZodType>(
  config: AxiosRequestConfig,
  schema: S,
): Promise<ApiResult<z.infer<S>>> {
  try {
    const response = await api.request(config);
    const parsed = schema.safeParse(response.data);
    if (!parsed.success) {
      return {
        kind: 'bad-data',
        message: 'The clinic server answered in a shape this app does not understand. Update the app.',
        temporary: false,
      };
    }
    return { kind: 'ok', data: parsed.data };
  } catch (error) {
    return failureFromError(error);
  }
}
