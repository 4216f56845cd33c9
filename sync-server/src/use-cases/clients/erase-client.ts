import { randomUUID } from 'node:crypto';
import type { EraseClientResponse } from '@/shared/protocol/practice';
import { syncEntities } from '@/shared/protocol/sync';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as repo from '../../repositories/erasure-repository';
import type { Caller, UseCaseDeps } from '../context';
import { requireFieldWrites } from '../field-access';
import { clientNotFound } from './client-records';

/** Devices pull within this time in practice; the tombstones stay that long before the rows are purged. */
export const PURGE_GRACE_MS = 30 * 24 * 60 * 60 * 1000;

const normaliseName = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

export async function eraseClient(
  deps: UseCaseDeps,
  caller: Caller,
  clientId: string,
  confirmName: string,
): Promise<EraseClientResponse> {
  // Erasure is a delete of every row of the client; blanking their fields is part of the delete.
  for (const entity of syncEntities) requireFieldWrites(caller.role, entity, ['deletedAt']);
  const erasureId = randomUUID();
  const outcome = await deps.sequelize.transaction(async (transaction) => {
    const client = await repo.lockClient(deps.sequelize, caller.clinicId, clientId, transaction);
    if (!client) throw clientNotFound();
    if (normaliseName(confirmName) !== normaliseName(`${client.first_name} ${client.last_name}`)) {
      throw new AppError(
        'confirmation_mismatch',
        "The typed name does not match the client's name; nothing was erased.",
        400,
      );
    }
    const hashes = await repo.clipHashesOfClient(deps.sequelize, caller.clinicId, clientId, transaction);
    const erased = await repo.countClientRecords(deps.sequelize, caller.clinicId, clientId, transaction);
    const rowsTombstoned = await repo.tombstoneClient(deps.sequelize, caller.clinicId, clientId, transaction);
    const blobs = await repo.deleteUnreferencedBlobs(deps.sequelize, caller.clinicId, hashes, transaction);
    await repo.insertErasure(
      deps.sequelize,
      {
        id: erasureId,
        clinicId: caller.clinicId,
        clientId,
        requestedBy: caller.userId,
        blobsDeleted: blobs.length,
      },
      transaction,
    );
    const storageKeys = blobs.map((b) => b.storage_key).filter((key): key is string => key !== null);
    await repo.queueBlobDeletions(
      deps.sequelize,
      { clinicId: caller.clinicId, erasureId, storageKeys },
      transaction,
    );
    // The log keeps that an erasure happened, by whom and when, and counts: never the erased data.
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'client.erase',
        entity: 'client',
        entityId: clientId,
        ip: caller.ip,
        details: { erasureId, ...erased, rowsTombstoned, blobsDeleted: blobs.length },
      },
      transaction,
    );
    return { rowsTombstoned, erased, clientName: `${client.first_name} ${client.last_name}` };
  });
  const blobsDeleted = await deleteQueuedBlobs(deps, { erasureId });
  return { erasureId, ...outcome, blobsDeleted };
}

/**
 * Deletes queued blobs from the configured blob store (local disk or S3). A delete that fails stays queued with
 * its error and attempt count, for the purge to retry; bytes another clip row still names are left alone.
 * Returns how many were deleted now.
 */
export async function deleteQueuedBlobs(
  deps: UseCaseDeps,
  filter: { erasureId?: string; clinicId?: string },
): Promise<number> {
  const { blobStore } = deps.services;
  let deleted = 0;
  for (const pending of await repo.pendingBlobDeletions(deps.sequelize, filter)) {
    try {
      if (!pending.still_needed) {
        await blobStore.delete(pending.storage_key);
        deleted++;
      }
      await repo.blobDeletionDone(deps.sequelize, pending.storage_key);
    } catch (error) {
      await repo.blobDeletionFailed(
        deps.sequelize,
        pending.storage_key,
        error instanceof Error ? error.message : String(error),
      );
    }
  }
  return deleted;
}

export async function purgeErased(
  deps: UseCaseDeps,
  options: { graceMs?: number; clinicId?: string } = {},
): Promise<number> {
  await deleteQueuedBlobs(deps, { clinicId: options.clinicId });
  const before = new Date(Date.now() - (options.graceMs ?? PURGE_GRACE_MS));
  const purged = await deps.sequelize.transaction((transaction) =>
    repo.purgeErasedClients(deps.sequelize, before, transaction, options.clinicId),
  );
  for (const p of purged) {
    await recordAuditEvent({
      clinicId: p.clinic_id,
      userId: null,
      action: 'client.purge',
      entity: 'client',
      entityId: p.client_id,
      details: { erasureId: p.id },
    });
  }
  return purged.length;
}
