import type {
  BlobStatusResponse,
  PullRequest,
  PullResponse,
  PushRequest,
  PushResponse,
} from '@/shared/protocol/sync';

/** Why a call failed; `temporary` decides whether the engine retries it later. */
export class TransportError extends Error {
  readonly temporary: boolean;
  readonly status?: number;
  /** The server refused this app version (426): retrying will not help until the app is updated. */
  readonly outdated: boolean;
  /**
   * The server no longer knows the upload in progress (tus: 404 or 410 to HEAD or PATCH on its URL, e.g. its
   * staging was cleared): the clip is still whole on the device, so it goes up again from a new upload.
   */
  readonly uploadLost: boolean;

  constructor(
    message: string,
    opts: { temporary: boolean; status?: number; outdated?: boolean; uploadLost?: boolean },
  ) {
    super(message);
    this.name = 'TransportError';
    this.temporary = opts.temporary;
    this.status = opts.status;
    this.outdated = opts.outdated ?? false;
    this.uploadLost = opts.uploadLost ?? false;
  }
}

export interface ClipUpload {
  sha256: string;
  bytes: Uint8Array;
  /** Resume this upload when set. */
  uploadUrl?: string;
  onUploadUrl(url: string): void | Promise<void>;
  onProgress(sent: number, total: number): void;
}

/** How the engine reaches the server: HTTP (axios + tus-js-client) in the app and the fault tests. */
export interface SyncTransport {
  push(request: PushRequest): Promise<PushResponse>;
  pull(request: PullRequest): Promise<PullResponse>;
  blobStatus(sha256: string): Promise<BlobStatusResponse>;
  uploadClip(upload: ClipUpload): Promise<void>;
}
