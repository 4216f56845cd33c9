import { QueryClient } from '@tanstack/react-query';
import { ApiFailure } from './result';

export function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // Only temporary failures (offline, 5xx, rate limit) are worth another try.
        retry: (count, error) => error instanceof ApiFailure && error.temporary && count < 2,
      },
    },
  });
}
