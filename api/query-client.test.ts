import { httpFailure } from '@/shared/http-failure';
import { makeQueryClient } from './query-client';
import { ApiFailure } from './result';

function retries(error: unknown, count = 0): boolean {
  const retry = makeQueryClient().getDefaultOptions().queries?.retry;
  if (typeof retry !== 'function') throw new Error('the query client decides retries with a function');
  return retry(count, error as Error);
}

describe('query retries', () => {
  test('when the network or the server fails for now, then the query tries again, twice at most', () => {
    for (const status of [undefined, 408, 429, 503]) {
      const failure = new ApiFailure(httpFailure(status, undefined));
      expect([status, retries(failure, 0), retries(failure, 1), retries(failure, 2)]).toEqual([
        status,
        true,
        true,
        false,
      ]);
    }
  });

  test('when the sign-in has ended, then the query waits for the person instead of asking again', () => {
    expect(retries(new ApiFailure(httpFailure(401, undefined)))).toBe(false);
  });

  test('when the request is refused for what it is, then asking again cannot help', () => {
    for (const status of [403, 404, 409, 426]) {
      expect([status, retries(new ApiFailure(httpFailure(status, undefined)))]).toEqual([status, false]);
    }
  });
});
