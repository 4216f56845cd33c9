import axios, { type AxiosInstance } from 'axios';
import * as tus from 'tus-js-client';
import {
  SYNC_PATHS,
  SYNC_PROTOCOL_HEADER,
  SYNC_PROTOCOL_VERSION,
  blobStatusResponseSchema,
  pullResponseSchema,
  pushResponseSchema,
  type PullRequest,
  type PushRequest,
} from '@/shared/protocol/sync';
import { httpFailure } from '../http-failure';
import { TransportError, type ClipUpload, type SyncTransport } from './transport';

export interface HttpTransportOptions {
  baseUrl: string;
  getAccessToken: () => string | null | Promise<string | null>;
  timeoutMs?: number;
  chunkSize?: number;
  axiosInstance?: AxiosInstance;
}

export { SYNC_PATHS };

export const DEFAULT_CHUNK_BYTES = 64 * 1024;

function fromStatus(status: number | undefined, body: unknown): TransportError {
  const failure = httpFailure(status, body);
  return new TransportError(failure.message, {
    temporary: failure.temporary,
    status,
    outdated: failure.kind === 'outdated',
  });
}

export function toTransportError(error: unknown): TransportError {
  if (error instanceof TransportError) return error;
  if (axios.isAxiosError(error)) return fromStatus(error.response?.status, error.response?.data);
  return new TransportError(error instanceof Error ? error.message : String(error), { temporary: true });
}

/** The sync transport over HTTP: axios for rows, tus (resumable) for clips. */
export function createHttpTransport(options: HttpTransportOptions): SyncTransport {
  const http =
    options.axiosInstance ?? axios.create({ baseURL: options.baseUrl, timeout: options.timeoutMs ?? 20_000 });
  const headers = async (): Promise<Record<string, string>> => {
    const token = await options.getAccessToken();
    // Spelled as the app's API client spells it, so a token it refreshes on a 401 replaces this one.
    return {
      [SYNC_PROTOCOL_HEADER]: String(SYNC_PROTOCOL_VERSION),
      ...(token ? { Authorization: `Bearer ${token}` } : {}),
    };
  };
  const url = (path: string) => (options.axiosInstance ? `${options.baseUrl}${path}` : path);

  return {
    async push(request: PushRequest) {
      try {
        const response = await http.post(url(SYNC_PATHS.push), request, { headers: await headers() });
        return pushResponseSchema.parse(response.data);
      } catch (error) {
        throw toTransportError(error);
      }
    },
    async pull(request: PullRequest) {
      try {
        const response = await http.post(url(SYNC_PATHS.pull), request, { headers: await headers() });
        return pullResponseSchema.parse(response.data);
      } catch (error) {
        throw toTransportError(error);
      }
    },
    async blobStatus(sha256: string) {
      try {
        const response = await http.get(url(SYNC_PATHS.blob(sha256)), { headers: await headers() });
        return blobStatusResponseSchema.parse(response.data);
      } catch (error) {
        throw toTransportError(error);
      }
    },
    async uploadClip(upload: ClipUpload) {
      const requestHeaders = await headers();
      await new Promise<void>((resolve, reject) => {
        const input = toUploadInput(upload.bytes);
        const task = new tus.Upload(input as never, {
          endpoint: `${options.baseUrl}${SYNC_PATHS.uploads}`,
          uploadUrl: upload.uploadUrl ?? null,
          headers: requestHeaders,
          metadata: {
            sha256: upload.sha256,
            filename: `${upload.sha256}.fpsl`,
            filetype: 'application/octet-stream',
          },
          uploadSize: upload.bytes.byteLength,
          // A 15 s take seals to about 240 KB: in 64 KB pieces a weak link that drops re-sends at most one piece,
          // and the outbox's progress moves while it goes.
          chunkSize: options.chunkSize ?? DEFAULT_CHUNK_BYTES,
          // The engine owns retries and their backoff; the URL is kept on the outbox item, not in tus's own store.
          retryDelays: [],
          storeFingerprintForResuming: false,
          fingerprint: async () => `fourpoint-clip-${upload.sha256}`,
          onUploadUrlAvailable: () => {
            if (task.url) void upload.onUploadUrl(task.url);
          },
          onProgress: (sent, total) => upload.onProgress(sent, total),
          onSuccess: () => resolve(),
          onError: (error) => {
            const detailed = error as tus.DetailedError;
            const status = detailed.originalResponse?.getStatus() || undefined;
            const method = detailed.originalRequest?.getMethod();
            // tus: a 404 or 410 on the upload's own URL means the server lost it. tus-js-client starts a new
            // upload by itself only when HEAD says so before resuming; a PATCH that meets it lands here.
            if ((status === 404 || status === 410) && (method === 'HEAD' || method === 'PATCH')) {
              reject(
                new TransportError(
                  'The clinic server lost this upload; it starts again from the beginning.',
                  {
                    temporary: true,
                    status,
                    uploadLost: true,
                  },
                ),
              );
              return;
            }
            reject(fromStatus(status, parseBody(detailed.originalResponse?.getBody())));
          },
        });
        task.start();
      });
    },
  };
}

/** tus hands over the body as text; the server's errors are JSON. */
function parseBody(text: string | undefined): unknown {
  try {
    return text ? JSON.parse(text) : undefined;
  } catch {
    return undefined;
  }
}

function toUploadInput(bytes: Uint8Array): unknown {
  const nodeBuffer = (globalThis as { Buffer?: { from(b: Uint8Array): unknown } }).Buffer;
  const isNode =
    typeof (globalThis as { process?: { versions?: { node?: string } } }).process?.versions?.node ===
    'string';
  if (isNode && nodeBuffer) return nodeBuffer.from(bytes);
  return new Blob([bytes as BlobPart]);
}
