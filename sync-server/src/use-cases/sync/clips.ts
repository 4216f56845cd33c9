import type { Sequelize } from 'sequelize';
import type { BlobStatusResponse } from '@/shared/protocol/sync';
import { AppError } from '../../errors';
import { saveClipTrace } from '../../repositories/clip-blobs-repository';
import { SyncRepository } from '../../repositories/sync-repository';
import type { BlobStore } from '../../services/blob-store';
import type { ClinicKeyStore } from '../../services/clinic-keys';
import type { ClipWorker } from '../../services/clip-worker';

export interface ClipDeps {
  sequelize: Sequelize;
  blobStore: BlobStore;
  clinicKeys: ClinicKeyStore;
  clipWorker: ClipWorker;
}

export async function blobStatus(
  sequelize: Sequelize,
  clinicId: string,
  sha256: string,
): Promise<BlobStatusResponse> {
  if (!/^[0-9a-f]{64}$/.test(sha256))
    throw new AppError('validation_failed', 'A clip is named by its sha256 in lowercase hex.', 400);
  const blob = await new SyncRepository(sequelize).clipBlob(clinicId, sha256);
  if (!blob) return { sha256, state: 'missing', failure: null };
  return { sha256, state: blob.state as BlobStatusResponse['state'], failure: blob.failure };
}

/**
 * An upload's bytes are all in `stagedFile`: check its hash, open it with the clinic's key and re-run the analysis
 * (in the clip worker, off the request thread), then keep the sealed bytes, attach the result of record to every
 * site recording that names this clip and keep its display trace with the clip. A refused clip (wrong hash, not
 * sealed, sealed for another clinic, unreadable) keeps no bytes: it throws an AppError before anything reaches the
 * blob store.
 */
export async function receiveClip(
  deps: ClipDeps,
  clinicId: string,
  declaredSha256: string,
  stagedFile: string,
): Promise<BlobStatusResponse> {
  const opened = await deps.clipWorker.open({
    file: stagedFile,
    declaredSha256,
    clinicPrivateKey: deps.clinicKeys.privateKey(clinicId),
  });
  if (opened.state === 'hash_mismatch') {
    throw new AppError(
      'hash_mismatch',
      `The uploaded clip does not match its hash (expected ${declaredSha256.slice(0, 12)}…, got ${opened.sha256.slice(0, 12)}…). It was not kept; the device will send it again.`,
      422,
    );
  }
  const stored =
    opened.state === 'opened'
      ? await deps.blobStore.putFile(stagedFile, opened.sha256, opened.sizeBytes)
      : null;
  const state = stored ? 'stored' : 'failed';
  const analysis = opened.state === 'opened' ? opened.analysis : null;
  const failure = opened.state === 'unreadable' ? opened.failure : null;
  await deps.sequelize.transaction(async (transaction) => {
    const repo = new SyncRepository(deps.sequelize, transaction);
    await repo.lockClinicForWrite(clinicId);
    await repo.saveClipBlob({
      sha256: opened.sha256,
      clinicId,
      sizeBytes: opened.sizeBytes,
      storageKey: stored?.storageKey ?? null,
      state,
      analysis,
      failure,
    });
    await repo.attachClipToRecordings(clinicId, opened.sha256, state, analysis);
    if (stored && opened.state === 'opened' && opened.trace)
      await saveClipTrace(deps.sequelize, clinicId, opened.sha256, opened.trace, transaction);
  });
  if (failure)
    throw new AppError(
      'clip_unreadable',
      `The clip arrived but cannot be opened: ${failure.replace(/\.$/, '')}. It was not kept.`,
      422,
    );
  return { sha256: opened.sha256, state, failure };
}
