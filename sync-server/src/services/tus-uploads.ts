import fs from 'node:fs/promises';
import path from 'node:path';
import type http from 'node:http';
import { FileStore } from '@tus/file-store';
import { Server, type DataStore } from '@tus/server';
import type { Request } from 'express';
import { SYNC_PATHS } from '@/shared/protocol/sync';
import { AppError } from '../errors';
import { callerOf } from '../middleware/authenticate';
import type { PgUploadLocker } from './upload-locks';

export const MAX_CLIP_BYTES = 64 * 1024 * 1024;

export interface TusHooks {
  /** Called once every byte of an upload is in `stagedFile`. Throw an AppError to refuse it. */
  onComplete(clinicId: string, sha256: string, stagedFile: string): Promise<void>;
  /** The size of the clip this clinic keeps under this hash, or null: HEAD answers for an upload already processed. */
  storedSize(clinicId: string, sha256: string): Promise<number | null>;
  /** Test seam, called after the last byte is written and before it is processed: the crash test dies here. */
  afterLastByte?(uploadId: string): void;
}

/** What became of a staged upload. */
export type StagedOutcome =
  { kind: 'absent' } | { kind: 'incomplete' } | { kind: 'stored' } | { kind: 'refused'; error: AppError };

export interface ClipUploads {
  /** Every tus request. A HEAD for a complete upload processes it first (it may have arrived before a crash). */
  handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void>;
  /**
   * Processes every upload whose bytes are all staged (run at start-up: the server may have died between the
   * last byte and its processing). Uploads still missing bytes are left for their device to finish.
   */
  processStaged(): Promise<{ stored: number; refused: number; failed: number }>;
}

const UPLOAD_ID = /^([0-9a-f-]{36})\.([0-9a-f]{64})\.([0-9a-z]+)$/;

const refuse = (status: number, message: string) => ({
  status_code: status,
  body: JSON.stringify({ error: { code: 'upload_refused', message } }),
});

/**
 * An upload id names one file in the staging folder, and tus has already decoded it (`%2F..%2F` is `/../`): it is
 * normalised first, so a path cannot pass the clinic prefix check and then lead out of the folder.
 */
function checkUploadId(uploadId: string, clinicId: string): void {
  const normalised = path.posix.normalize(uploadId.replaceAll('\\', '/'));
  if (normalised !== uploadId || normalised.includes('/'))
    throw refuse(400, 'An upload id is a single name; it cannot contain a path (/, \\ or ..).');
  if (!normalised.startsWith(`${clinicId}.`)) throw refuse(404, 'There is no such upload.');
}

/**
 * Where uploads in progress live, shared by every instance: a folder (the local default) or object storage
 * (tus-s3-staging.ts). Processing needs a complete upload's bytes as a local file.
 */
export interface UploadStaging {
  datastore: DataStore;
  /** A complete upload's bytes as a local file; `release` removes that copy (never the upload itself). */
  localCopy(uploadId: string): Promise<{ file: string; release(): Promise<void> }>;
  /** Removes an upload's bytes and its bookkeeping (kept in the blob store, or refused). */
  remove(uploadId: string): Promise<void>;
  /** The ids of uploads in progress or complete (the staged-uploads job looks for complete ones). */
  list(): Promise<string[]>;
}

/** Uploads in progress in one folder every instance shares (each upload's bytes beside its .json sidecar). */
export function folderStaging(directory: string): UploadStaging {
  return {
    datastore: new FileStore({ directory }),
    localCopy: async (uploadId) => ({ file: path.join(directory, uploadId), release: async () => undefined }),
    async remove(uploadId) {
      const file = path.join(directory, uploadId);
      await fs.rm(file, { force: true });
      await fs.rm(`${file}.json`, { force: true });
    },
    list: async () =>
      (await fs.readdir(directory).catch(() => [] as string[]))
        .filter((name) => name.endsWith('.json'))
        .map((name) => name.slice(0, -'.json'.length)),
  };
}

/**
 * Resumable clip uploads (tus 1.0). Uploads are named `<clinicId>.<sha256>.<random>`, so a request for another
 * clinic's upload is refused before tus touches it. The routes in front have already checked the caller's role.
 */
export function createClipUploads(
  staging: UploadStaging,
  hooks: TusHooks,
  options: {
    /**
     * Locks shared by every process using `staging` (several instances behind a balancer). Without it, tus's
     * in-memory locker and this process's own bookkeeping keep one process's requests apart, which is enough
     * only when one process serves the uploads.
     */
    locker?: PgUploadLocker;
  } = {},
): ClipUploads {
  const { datastore } = staging;
  const { locker } = options;
  // A clip is processed under this lock, so an upload whose last PATCH reached one instance while its HEAD reached
  // another is processed once; the second finds the staged file gone and answers from the blob store.
  const processOnce = (uploadId: string) =>
    locker
      ? locker.withLock(`process:${uploadId}`, () => settleOnce(uploadId), 120_000)
      : settleOnce(uploadId);
  const inFlight = new Map<string, Promise<StagedOutcome>>();

  // One processing per upload at a time: the last PATCH, a HEAD and the start-up scan may all ask at once.
  const settle = (uploadId: string): Promise<StagedOutcome> => {
    const running = inFlight.get(uploadId);
    if (running) return running;
    const started = processOnce(uploadId).finally(() => inFlight.delete(uploadId));
    inFlight.set(uploadId, started);
    return started;
  };

  const settleOnce = async (uploadId: string): Promise<StagedOutcome> => {
    const [, clinicId, sha256] = UPLOAD_ID.exec(uploadId) ?? [];
    if (!clinicId) return { kind: 'absent' };
    let upload;
    try {
      upload = await datastore.getUpload(uploadId);
    } catch {
      return { kind: 'absent' };
    }
    if (upload.size === undefined || upload.offset !== upload.size) return { kind: 'incomplete' };
    let outcome: StagedOutcome;
    const copy = await staging.localCopy(uploadId);
    try {
      await hooks.onComplete(clinicId, sha256, copy.file);
      outcome = { kind: 'stored' };
    } catch (error) {
      // Anything but a refusal (the database or the blob store down) keeps the staged bytes for a retry.
      if (!(error instanceof AppError)) throw error;
      outcome = { kind: 'refused', error };
    } finally {
      await copy.release();
    }
    // Kept in the blob store, or refused: either way the staged bytes and their bookkeeping go.
    await staging.remove(uploadId);
    return outcome;
  };

  const tus = new Server({
    path: SYNC_PATHS.uploads,
    datastore,
    ...(locker ? { locker } : {}),
    maxSize: MAX_CLIP_BYTES,
    respectForwardedHeaders: false,
    namingFunction: (req, metadata) => {
      const caller = callerOf(req as Request);
      const sha256 = metadata?.sha256 ?? '';
      if (!/^[0-9a-f]{64}$/.test(sha256))
        throw refuse(400, 'An upload needs its sha256 (lowercase hex) in its metadata.');
      return `${caller.clinicId}.${sha256}.${Math.random().toString(36).slice(2, 10)}`;
    },
    onIncomingRequest: async (req, _res, uploadId) => {
      const caller = callerOf(req as Request);
      if (uploadId) checkUploadId(uploadId, caller.clinicId);
    },
    onUploadFinish: async (_req: http.IncomingMessage, res: http.ServerResponse, upload) => {
      hooks.afterLastByte?.(upload.id);
      const outcome = await settle(upload.id);
      if (outcome.kind === 'refused') throw refuse(outcome.error.httpStatus, outcome.error.message);
      return res;
    },
  });

  /** The caller's upload id when this is a HEAD for one, else null (tus then answers as usual). */
  const headedUpload = (req: http.IncomingMessage): string | null => {
    if (req.method !== 'HEAD') return null;
    const id = new URL(req.url ?? '', 'http://uploads.invalid').pathname.split('/').pop() ?? '';
    const match = UPLOAD_ID.exec(id);
    return match && match[1] === callerOf(req as Request).clinicId ? id : null;
  };

  return {
    async handle(req, res) {
      const uploadId = headedUpload(req);
      if (uploadId) {
        const outcome = await settle(uploadId);
        if (outcome.kind === 'stored' || outcome.kind === 'absent') {
          const [, clinicId, sha256] = UPLOAD_ID.exec(uploadId)!;
          const size = await hooks.storedSize(clinicId, sha256);
          if (size !== null) {
            // The staged bytes are gone because they are kept: to the device this upload is complete.
            res.writeHead(200, {
              'Tus-Resumable': '1.0.0',
              'Upload-Offset': String(size),
              'Upload-Length': String(size),
              'Cache-Control': 'no-store',
            });
            res.end();
            return;
          }
        }
      }
      await tus.handle(req, res);
    },
    async processStaged() {
      const counts = { stored: 0, refused: 0, failed: 0 };
      for (const uploadId of await staging.list()) {
        try {
          const outcome = await settle(uploadId);
          if (outcome.kind === 'stored') counts.stored++;
          if (outcome.kind === 'refused') counts.refused++;
        } catch {
          counts.failed++;
        }
      }
      return counts;
    },
  };
}
