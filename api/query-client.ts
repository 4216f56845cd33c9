import { QueryClient } from '@tanstack/react-query';
import { ApiFailure } from './result';

export function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // Only temporary failures are worth another try, and not an ended sign-in: the API client has already
        // tried to refresh it, and the request waits for the person to sign in again.
        retry: (count, error) =>
          error instanceof ApiFailure && error.temporary && error.result.kind !== 'unauthorized' && count < 2,
      },
    },
  });
}
