import type { Sequelize } from 'sequelize';
import type { BlobStatusResponse } from '@/shared/protocol/sync';
import { openClip, SealError, sha256Hex } from '@/shared/seal';
import { AppError } from '../../errors';
import { SyncRepository } from '../../repositories/sync-repository';
import type { BlobStore } from '../../services/blob-store';
import type { ClinicKeyStore } from '../../services/clinic-keys';
import { analyseClip } from './analyse-clip';

export interface ClipDeps {
  sequelize: Sequelize;
  blobStore: BlobStore;
  clinicKeys: ClinicKeyStore;
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
 * An upload is complete: check its hash, keep the sealed bytes, open them with the clinic's key, re-run the
 * analysis and attach the result of record to every site recording that names this clip.
 */
export async function receiveClip(
  deps: ClipDeps,
  clinicId: string,
  declaredSha256: string,
  sealed: Uint8Array,
): Promise<BlobStatusResponse> {
  const actual = sha256Hex(sealed);
  if (actual !== declaredSha256) {
    throw new AppError(
      'hash_mismatch',
      `The uploaded clip does not match its hash (expected ${declaredSha256.slice(0, 12)}…, got ${actual.slice(0, 12)}…). It was not kept; the device will send it again.`,
      422,
    );
  }
  const stored = await deps.blobStore.put(sealed);

  let analysis: unknown = null;
  let failure: string | null = null;
  try {
    const plain = openClip(sealed, deps.clinicKeys.privateKey(clinicId));
    analysis = analyseClip(plain);
  } catch (error) {
    if (!(error instanceof SealError)) throw error;
    failure = error.message;
  }
  const state = failure ? 'failed' : 'stored';
  await deps.sequelize.transaction(async (transaction) => {
    const repo = new SyncRepository(deps.sequelize, transaction);
    await repo.lockClinicForWrite(clinicId);
    await repo.saveClipBlob({
      sha256: actual,
      clinicId,
      sizeBytes: stored.sizeBytes,
      storageKey: stored.storageKey,
      state,
      analysis,
      failure,
    });
    await repo.attachClipToRecordings(clinicId, actual, state, analysis);
  });
  if (failure)
    throw new AppError('clip_unreadable', `The clip arrived but cannot be opened: ${failure}`, 422);
  return { sha256: actual, state, failure };
}
