import fs from 'node:fs/promises';
import path from 'node:path';
import type http from 'node:http';
import { FileStore } from '@tus/file-store';
import { Server } from '@tus/server';
import type { Request } from 'express';
import { SYNC_PATHS } from '@/shared/protocol/sync';
import { AppError } from '../errors';
import { callerOf } from '../middleware/authenticate';

export const MAX_CLIP_BYTES = 64 * 1024 * 1024;

export interface TusHooks {
  /** Called with the whole sealed upload once its last byte is in. Throw an AppError to refuse it. */
  onComplete(clinicId: string, sha256: string, bytes: Uint8Array): Promise<void>;
}

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
 * Resumable clip uploads (tus 1.0). Uploads are named `<clinicId>.<sha256>.<random>`, so a request for another
 * clinic's upload is refused before tus touches it. The routes in front have already checked the caller's role.
 */
export function createTusServer(directory: string, hooks: TusHooks): Server {
  const datastore = new FileStore({ directory });
  return new Server({
    path: SYNC_PATHS.uploads,
    datastore,
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
    onUploadFinish: async (req: http.IncomingMessage, res: http.ServerResponse, upload) => {
      const [clinicId, sha256] = upload.id.split('.');
      const file = path.join(directory, upload.id);
      const bytes = new Uint8Array(await fs.readFile(file));
      try {
        await hooks.onComplete(clinicId, sha256, bytes);
      } catch (error) {
        if (error instanceof AppError) throw refuse(error.httpStatus, error.message);
        throw error;
      } finally {
        // The blob store holds the kept copy; the staging file and its .json sidecar can go.
        await fs.rm(file, { force: true });
        await fs.rm(`${file}.json`, { force: true });
      }
      return res;
    },
  });
}
