import { isAxiosError } from 'axios';
import { apiErrorSchema } from '@/shared/protocol';

// Every API call answers one of these; `temporary` tells callers (and queues) whether a retry can help.
export type ApiResult<T> =
  | { kind: 'ok'; data: T }
  | { kind: 'unauthorized'; message: string }
  | { kind: 'forbidden'; message: string }
  | { kind: 'not-found'; message: string }
  | { kind: 'rejected'; status: number; message: string }
  | { kind: 'rate-limited'; message: string; temporary: true }
  | { kind: 'server'; status: number; message: string; temporary: true }
  | { kind: 'offline'; message: string; temporary: true }
  | { kind: 'bad-data'; message: string };

export type ApiFailureResult = Exclude<ApiResult<never>, { kind: 'ok' }>;

export const offlineMessage = 'Network unreachable: check the connection to the clinic server and try again.';

/** Thrown inside TanStack Query functions so the query's error state carries the typed result. */
export class ApiFailure extends Error {
  constructor(readonly result: ApiFailureResult) {
    super(result.message);
    this.name = 'ApiFailure';
  }

  get temporary(): boolean {
    return 'temporary' in this.result && this.result.temporary;
  }
}

function serverMessage(body: unknown): string | undefined {
  const parsed = apiErrorSchema.safeParse(body);
  return parsed.success ? parsed.data.error.message : undefined;
}

export function failureFromError(error: unknown): ApiFailureResult {
  if (!isAxiosError(error)) {
    return { kind: 'bad-data', message: error instanceof Error ? error.message : 'Unexpected error.' };
  }
  const response = error.response;
  if (!response) return { kind: 'offline', message: offlineMessage, temporary: true };
  const status = response.status;
  const message = serverMessage(response.data);
  if (status === 401)
    return { kind: 'unauthorized', message: message ?? 'Your sign-in has ended. Sign in again.' };
  if (status === 403) return { kind: 'forbidden', message: message ?? 'Your role does not allow this.' };
  if (status === 404) return { kind: 'not-found', message: message ?? 'Not found.' };
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
      message: message ?? `The clinic server had a problem (${status}). Try again shortly.`,
      temporary: true,
    };
  }
  return { kind: 'rejected', status, message: message ?? `The request was refused (${status}).` };
}

export function unwrap<T>(result: ApiResult<T>): T {
  if (result.kind === 'ok') return result.data;
  throw new ApiFailure(result);
}
