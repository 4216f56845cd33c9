import {
  AxiosError,
  AxiosHeaders,
  type AxiosAdapter,
  type AxiosResponse,
  type InternalAxiosRequestConfig,
} from 'axios';
import { z } from 'zod';
import type { SignInResponse } from '@/shared/protocol';
import { api, connectSession, refreshClient, request } from './client';

const user = {
  id: '5b7c9d1e-2f3a-4b5c-8d6e-7f8091a2b3c4',
  email: 'client-test@demo.fourpoint.test',
  role: 'operator' as const,
  clinicId: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
  timeZone: 'UTC',
  name: 'Client Test',
};

function answer(config: InternalAxiosRequestConfig, status: number, data: unknown): AxiosResponse {
  const response = { data, status, statusText: String(status), headers: {}, config };
  if (status >= 400) throw new AxiosError(`status ${status}`, 'ERR_BAD_RESPONSE', config, {}, response);
  return response;
}

function bearer(config: InternalAxiosRequestConfig): string | undefined {
  return AxiosHeaders.from(config.headers).get('Authorization')?.toString();
}

let session: SignInResponse | null;
const onRefreshed = jest.fn((next: SignInResponse) => {
  session = next;
});
const onExpired = jest.fn();

beforeEach(() => {
  session = { accessToken: 'old-access', refreshToken: 'refresh-1', user };
  onRefreshed.mockClear();
  onExpired.mockClear();
  connectSession({ get: () => session, onRefreshed, onExpired });
});

const okSchema = z.object({ ok: z.literal(true) });

describe('API client', () => {
  test('when the access token has expired, then it refreshes once and retries with the new token', async () => {
    const seen: (string | undefined)[] = [];
    api.defaults.adapter = (async (config) => {
      seen.push(bearer(config));
      return bearer(config) === 'Bearer new-access'
        ? answer(config, 200, { ok: true })
        : answer(config, 401, {});
    }) as AxiosAdapter;
    refreshClient.defaults.adapter = (async (config) => {
      expect(JSON.parse(config.data as string)).toEqual({ refreshToken: 'refresh-1' });
      return answer(config, 200, { accessToken: 'new-access', refreshToken: 'refresh-2', user });
    }) as AxiosAdapter;

    const result = await request({ method: 'GET', url: '/clients' }, okSchema);

    expect(result).toEqual({ kind: 'ok', data: { ok: true } });
    expect(seen).toEqual(['Bearer old-access', 'Bearer new-access']);
    expect(onRefreshed).toHaveBeenCalledTimes(1);
    expect(session?.refreshToken).toBe('refresh-2');
  });

  test('when a web session (refresh token in the cookie) refreshes, then it posts an empty JSON body the cookie goes with', async () => {
    session = { accessToken: 'old-access', user };
    api.defaults.adapter = (async (config) =>
      bearer(config) === 'Bearer new-access'
        ? answer(config, 200, { ok: true })
        : answer(config, 401, {})) as AxiosAdapter;
    refreshClient.defaults.adapter = (async (config) => {
      // The server takes the cookie only from a JSON request (a cross-site form cannot send one).
      expect(AxiosHeaders.from(config.headers).getContentType()).toMatch(/^application\/json/);
      expect(JSON.parse(config.data as string)).toEqual({});
      return answer(config, 200, { accessToken: 'new-access', user });
    }) as AxiosAdapter;

    const result = await request({ method: 'GET', url: '/clients' }, okSchema);

    expect(result).toEqual({ kind: 'ok', data: { ok: true } });
    expect(session).toEqual({ accessToken: 'new-access', user });
  });

  test('when the refresh is refused too, then the session is expired and the answer is unauthorized', async () => {
    let calls = 0;
    api.defaults.adapter = (async (config) => {
      calls += 1;
      return answer(config, 401, { error: { code: 'unauthorized', message: 'Sign in again.' } });
    }) as AxiosAdapter;
    refreshClient.defaults.adapter = (async (config) => answer(config, 401, {})) as AxiosAdapter;

    const result = await request({ method: 'GET', url: '/sessions' }, okSchema);

    // Temporary: the request itself is sound; it goes through once the person signs in again.
    expect(result).toEqual({ kind: 'unauthorized', message: 'Sign in again.', temporary: true });
    expect(calls).toBe(1);
    expect(onExpired).toHaveBeenCalledTimes(1);
  });

  test('when the network is down, then the answer is offline and temporary, and the session is kept', async () => {
    api.defaults.adapter = (async (config) => {
      throw new AxiosError('Network Error', 'ERR_NETWORK', config);
    }) as AxiosAdapter;

    const result = await request({ method: 'GET', url: '/users' }, okSchema);

    expect(result).toMatchObject({ kind: 'offline', temporary: true });
    expect(onExpired).not.toHaveBeenCalled();
  });

  test("when the server answers 429, then the answer is rate-limited with the server's message", async () => {
    api.defaults.adapter = (async (config) =>
      answer(config, 429, {
        error: { code: 'rate_limited', message: 'Too many attempts; wait 15 minutes.' },
      })) as AxiosAdapter;

    const result = await request({ method: 'POST', url: '/auth/sign-in', data: {} }, okSchema);

    expect(result).toEqual({
      kind: 'rate-limited',
      message: 'Too many attempts; wait 15 minutes.',
      temporary: true,
    });
  });

  test('when the body does not match the protocol schema, then the answer is bad-data', async () => {
    api.defaults.adapter = (async (config) => answer(config, 200, { ok: 'yes' })) as AxiosAdapter;

    const result = await request({ method: 'GET', url: '/clients' }, okSchema);

    expect(result.kind).toBe('bad-data');
  });
});
