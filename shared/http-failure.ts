import { apiErrorSchema, OUTDATED_CLIENT_MESSAGE } from './protocol/errors';

/**
 * A failed answer from the clinic server, read the same way by the screens (api/result.ts) and by the sync engine
 * (shared/sync/http-transport.ts). `temporary`: the same request, unchanged, may succeed later, so work behind it
 * is kept and tried again rather than refused. That includes a 401: the API client has already tried to refresh
 * the sign-in, so the person signs in again and the request then goes through as it is.
 */
export type HttpFailure =
  | { kind: 'offline'; message: string; temporary: true }
  | { kind: 'unauthorized'; message: string; temporary: true }
  | { kind: 'forbidden'; message: string; temporary: false }
  | { kind: 'not-found'; status: number; message: string; temporary: false }
  | { kind: 'outdated'; message: string; temporary: false }
  | { kind: 'rate-limited'; message: string; temporary: true }
  | { kind: 'server'; status: number; message: string; temporary: true }
  | { kind: 'rejected'; status: number; message: string; temporary: boolean };

export const offlineMessage = 'Network unreachable: check the connection to the clinic server and try again.';

/** The server's own words when the body is its `{ error: { code, message } }` shape. */
export function serverMessage(body: unknown): string | undefined {
  const parsed = apiErrorSchema.safeParse(body);
  return parsed.success ? parsed.data.error.message : undefined;
}

/** `status` is undefined when no answer came back (offline, timed out, cut off). */
export function httpFailure(status: number | undefined, body: unknown): HttpFailure {
  if (status === undefined) return { kind: 'offline', message: offlineMessage, temporary: true };
  const message = serverMessage(body);
  if (status === 401) {
    return {
      kind: 'unauthorized',
      message: message ?? 'Your sign-in has ended. Sign in again.',
      temporary: true,
    };
  }
  if (status === 403) {
    return { kind: 'forbidden', message: message ?? 'Your role does not allow this.', temporary: false };
  }
  if (status === 404 || status === 410) {
    return { kind: 'not-found', status, message: message ?? 'Not found.', temporary: false };
  }
  if (status === 426) {
    return {
      kind: 'outdated',
      message: message ?? OUTDATED_CLIENT_MESSAGE,
      temporary: false,
    };
  }
  if (status === 429) {
    return {
      kind: 'rate-limited',
      message: message ?? 'Too many attempts. Wait a minute, then try again.',
      temporary: true,
    };
  }
  if (status >= 500) {
    return {
      kind: 'server',
      status,
      message: message ?? 'The clinic server had a problem. Try again shortly.',
      temporary: true,
    };
  }
  // 408: the server gave up waiting for the request; sending it again is how it is meant to be answered.
  return {
    kind: 'rejected',
    status,
    message: message ?? 'The clinic server refused this request.',
    temporary: status === 408,
  };
}
