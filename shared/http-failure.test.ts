import { AxiosError, AxiosHeaders, type AxiosResponse, type InternalAxiosRequestConfig } from 'axios';
import { httpFailure, offlineMessage } from './http-failure';
import { OUTDATED_CLIENT_MESSAGE } from './protocol/sync';
import { toTransportError } from './sync/http-transport';

const serverError = (message: string) => ({ error: { code: 'some_code', message } });

function axiosFailure(status: number | undefined, data: unknown): AxiosError {
  const config = { headers: new AxiosHeaders() } as InternalAxiosRequestConfig;
  const response =
    status === undefined
      ? undefined
      : ({ status, data, statusText: '', headers: {}, config } as AxiosResponse);
  return new AxiosError('failed', 'ERR_BAD_RESPONSE', config, {}, response);
}

describe('reading a failed answer from the clinic server', () => {
  // What "may succeed later unchanged" means for each status, from the standards that define them:
  // RFC 9110 (HTTP Semantics) §15.5.2 401, §15.5.4 403, §15.5.5 404, §15.5.9 408, §15.5.11 410, §15.5.22 426,
  // §15.6 5xx; RFC 6585 §4 429.
  test.each([
    [undefined, 'offline', true],
    [401, 'unauthorized', true], // §15.5.2: the request may be repeated with new credentials
    [403, 'forbidden', false], // §15.5.4: the server understood and will not fulfil it, whoever asks
    [404, 'not-found', false],
    [410, 'not-found', false],
    [408, 'rejected', true], // §15.5.9: the client may repeat the request
    [409, 'rejected', false],
    [422, 'rejected', false],
    [426, 'outdated', false], // §15.5.22: refused until the client upgrades
    [429, 'rate-limited', true], // RFC 6585 §4: too many requests for now
    [500, 'server', true],
    [503, 'server', true], // §15.6.4: a temporary overload or maintenance
  ])('a %s answer is %s, temporary %s', (status, kind, temporary) => {
    const failure = httpFailure(status, undefined);
    expect(failure).toMatchObject({ kind, temporary });
  });

  test('when the server explains itself, then its words are shown', () => {
    expect(httpFailure(409, serverError('This record was changed by someone else.')).message).toBe(
      'This record was changed by someone else.',
    );
  });

  test('when nothing came back, then the message says the network is unreachable', () => {
    expect(httpFailure(undefined, undefined).message).toBe(offlineMessage);
  });

  test('when the app is too old, then the message says to update it', () => {
    expect(httpFailure(426, undefined).message).toBe(OUTDATED_CLIENT_MESSAGE);
  });

  test('the sync transport reads a failure exactly as the screens do', () => {
    for (const status of [undefined, 401, 403, 404, 408, 409, 426, 429, 500, 503]) {
      const body = serverError('Words from the server.');
      const failure = httpFailure(status, body);
      const transportError = toTransportError(axiosFailure(status, body));
      expect({ message: transportError.message, temporary: transportError.temporary }).toEqual({
        message: failure.message,
        temporary: failure.temporary,
      });
      expect(transportError.outdated).toBe(status === 426);
    }
  });
});
