import { isAxiosError } from 'axios';

import { httpFailure, type HttpFailure } from '@/shared/http-failure';

export { offlineMessage } from '@/shared/http-failure';

// Every API call answers one of these; `temporary` tells callers (and queues) whether a retry can help.
export type ApiResult<T> =
  { kind: 'ok'; data: T } | HttpFailure | { kind: 'bad-data'; message: string; temporary: false };

export type ApiFailureResult = Exclude<ApiResult<never>, { kind: 'ok' }>;

/** Thrown inside TanStack Query functions so the query's error state carries the typed result. */
export class ApiFailure extends Error {
  constructor(readonly result: ApiFailureResult) {
    super(result.message);
    this.name = 'ApiFailure';
  }

  get temporary(): boolean {
    return this.result.temporary;
  }
}

export function failureFromError(error: unknown): ApiFailureResult {
  if (!isAxiosError(error)) {
    return {
      kind: 'bad-data',
      message: error instanceof Error ? error.message : 'Unexpected error.',
      temporary: false,
    };
  }
  return httpFailure(error.response?.status, error.response?.data);
}

export function unwrap<T>(result: ApiResult<T>): T {
  if (result.kind === 'ok') return result.data;
  throw new ApiFailure(result);
}
