import type { Request } from 'express';
import {
  OUTDATED_CLIENT_MESSAGE,
  SYNC_PROTOCOL_HEADER,
  SYNC_PROTOCOL_VERSION,
  conflictListQuerySchema,
  pullRequestSchema,
  pushRequestSchema,
  resolveConflictRequestSchema,
  type BlobStatusResponse,
  type ClinicPublicKeyResponse,
  type ConflictListResponse,
  type PullResponse,
  type PushResponse,
} from '@/shared/protocol/sync';
import { bytesToHex } from '@/shared/seal';
import { AppError } from '../errors';
import { callerOf } from '../middleware/authenticate';
import { blobStatus } from '../use-cases/sync/clips';
import { getConflict, listConflicts, resolveConflict } from '../use-cases/sync/conflicts';
import { pullChanges } from '../use-cases/sync/pull';
import { pushChanges } from '../use-cases/sync/push';
import type { HandlerFactory } from './handlers';
import { rowId } from './row-ids';

/** Devices say which protocol they speak (header, or protocolVersion in the body); others get 426. */
function requireProtocol(req: Request): void {
  const fromBody = (req.body as { protocolVersion?: unknown } | undefined)?.protocolVersion;
  const stated = req.get(SYNC_PROTOCOL_HEADER) ?? (fromBody === undefined ? undefined : String(fromBody));
  if (stated !== String(SYNC_PROTOCOL_VERSION)) {
    throw new AppError('outdated_client', OUTDATED_CLIENT_MESSAGE, 426, {
      serverProtocol: SYNC_PROTOCOL_VERSION,
      clientProtocol: stated ?? null,
    });
  }
}

export const syncPush: HandlerFactory = (deps) => async (req, res) => {
  requireProtocol(req);
  const body: PushResponse = await pushChanges(
    deps.sequelize,
    callerOf(req),
    pushRequestSchema.parse(req.body),
  );
  res.json(body);
};

export const syncPull: HandlerFactory = (deps) => async (req, res) => {
  requireProtocol(req);
  const request = pullRequestSchema.parse(req.body);
  const body: PullResponse = await pullChanges(
    deps.sequelize,
    callerOf(req),
    request.checkpoint,
    request.limit,
  );
  res.json(body);
};

export const syncBlobStatus: HandlerFactory = (deps) => async (req, res) => {
  requireProtocol(req);
  const body: BlobStatusResponse = await blobStatus(
    deps.sequelize,
    callerOf(req).clinicId,
    String(req.params.sha256),
  );
  res.json(body);
};

/** tus requests (POST, HEAD, PATCH, DELETE) all go to the one tus server. */
export const syncUploads: HandlerFactory = (deps) => async (req, res) => {
  requireProtocol(req);
  // tus takes the upload id from the end of req.url, query and all, and decodes it again; the tus routes take
  // no query, so it gets the path alone (a stray `%` after `?` made it throw).
  req.url = req.path;
  await deps.services.uploads.handle(req, res);
};

export const clinicPublicKey: HandlerFactory = (deps) => async (req, res) => {
  const key = deps.services.clinicKeys.publicKey(callerOf(req).clinicId);
  const body: ClinicPublicKeyResponse = { algorithm: 'x25519', publicKey: bytesToHex(key) };
  res.json(body);
};

export const conflictList: HandlerFactory = (deps) => async (req, res) => {
  const { status } = conflictListQuerySchema.parse(req.query);
  const body: ConflictListResponse = {
    conflicts: await listConflicts(deps.sequelize, callerOf(req), status),
  };
  res.json(body);
};

export const conflictDetail: HandlerFactory = (deps) => async (req, res) => {
  const id = rowId(req);
  res.json({ conflict: await getConflict(deps.sequelize, callerOf(req), id) });
};

export const conflictResolve: HandlerFactory = (deps) => async (req, res) => {
  const id = rowId(req);
  res.json(
    await resolveConflict(deps.sequelize, callerOf(req), id, resolveConflictRequestSchema.parse(req.body)),
  );
};
