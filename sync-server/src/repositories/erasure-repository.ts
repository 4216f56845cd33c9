import type { Sequelize, Transaction } from 'sequelize';
import type { EraseClientResponse } from '@/shared/protocol/practice';
import { execute, selectRows } from './sql';

const ERASED = 'erased';

export async function lockClient(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  transaction: Transaction,
) {
  const rows = await selectRows<{ id: string; first_name: string; last_name: string }>(
    sequelize,
    `SELECT id, first_name, last_name FROM clients WHERE clinic_id = :clinicId AND id = :clientId AND deleted_at IS NULL FOR UPDATE`,
    { clinicId, clientId },
    transaction,
  );
  return rows[0] ?? null;
}

export const clipHashesOfClient = async (
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  transaction: Transaction,
) =>
  (
    await selectRows<{ sha256: string }>(
      sequelize,
      `SELECT DISTINCT r.clip_sha256 AS sha256 FROM site_recordings r JOIN recording_sessions s ON s.id = r.session_id
       WHERE s.clinic_id = :clinicId AND s.client_id = :clientId AND r.clip_sha256 IS NOT NULL`,
      { clinicId, clientId },
      transaction,
    )
  ).map((r) => r.sha256);

type ErasedCounts = EraseClientResponse['erased'];

/** What the client has that a person would count, before the erasure: visits, recordings with sound, consents, report e-mails. */
export async function countClientRecords(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  transaction: Transaction,
): Promise<ErasedCounts> {
  const sessions = `SELECT id FROM recording_sessions WHERE clinic_id = :clinicId AND client_id = :clientId AND deleted_at IS NULL`;
  const [row] = await selectRows<Record<keyof ErasedCounts, string>>(
    sequelize,
    `SELECT (${sessions.replace('SELECT id', 'SELECT count(*)')}) AS "visits",
       (SELECT count(*) FROM site_recordings WHERE clinic_id = :clinicId AND deleted_at IS NULL AND clip_sha256 IS NOT NULL
          AND session_id IN (${sessions})) AS "recordings",
       (SELECT count(*) FROM consents WHERE clinic_id = :clinicId AND client_id = :clientId AND deleted_at IS NULL) AS "consents",
       (SELECT count(*) FROM report_mails WHERE clinic_id = :clinicId AND session_id IN (${sessions})) AS "reportEmails"`,
    { clinicId, clientId },
    transaction,
  );
  return {
    visits: Number(row.visits),
    recordings: Number(row.recordings),
    consents: Number(row.consents),
    reportEmails: Number(row.reportEmails),
  };
}

/**
 * Tombstones every row of the client the way a synced delete does (deleted_at set, version bumped; the
 * change_seq trigger numbers the change), so devices drop their copies on their next pull, and blanks the
 * personal fields at once: the tombstones carry nothing but ids until they are purged.
 */
export async function tombstoneClient(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  transaction: Transaction,
): Promise<number> {
  const r = { clinicId, clientId, erased: ERASED };
  const sessions = `SELECT id FROM recording_sessions WHERE clinic_id = :clinicId AND client_id = :clientId`;
  let rows = 0;
  rows += await execute(
    sequelize,
    `UPDATE site_recordings SET deleted_at = coalesce(deleted_at, now()), analysis = NULL, clip_sha256 = NULL, clip_state = 'none',
       duration_s = NULL, skipped_reason = NULL, keep_anyway_note = NULL, quality_verdict = NULL, version = version + 1, updated_at = now()
     WHERE clinic_id = :clinicId AND session_id IN (${sessions})`,
    r,
    transaction,
  );
  rows += await execute(
    sequelize,
    `UPDATE recording_sessions SET deleted_at = coalesce(deleted_at, now()), findings = NULL, plan = NULL, follow_up_date = NULL,
       version = version + 1, updated_at = now()
     WHERE clinic_id = :clinicId AND client_id = :clientId`,
    r,
    transaction,
  );
  rows += await execute(
    sequelize,
    `UPDATE consents SET deleted_at = coalesce(deleted_at, now()), typed_name = :erased, version = version + 1, updated_at = now()
     WHERE clinic_id = :clinicId AND client_id = :clientId`,
    r,
    transaction,
  );
  rows += await execute(
    sequelize,
    `UPDATE clients SET deleted_at = now(), first_name = :erased, last_name = :erased, date_of_birth = NULL, email = NULL, phone = NULL,
       notes = NULL, version = version + 1, updated_at = now()
     WHERE clinic_id = :clinicId AND id = :clientId`,
    r,
    transaction,
  );
  // A report e-mail keeps the client's address and the report PDF: it goes now, not at the purge.
  await execute(
    sequelize,
    `DELETE FROM report_mails WHERE clinic_id = :clinicId AND session_id IN (${sessions})`,
    r,
    transaction,
  );
  await execute(
    sequelize,
    `DELETE FROM follow_up_reminders WHERE clinic_id = :clinicId AND client_id = :clientId`,
    r,
    transaction,
  );
  await execute(
    sequelize,
    `DELETE FROM visit_packages WHERE clinic_id = :clinicId AND client_id = :clientId`,
    r,
    transaction,
  );
  await execute(
    sequelize,
    `UPDATE payments SET client_id = NULL, checkout_url = NULL, updated_at = now() WHERE clinic_id = :clinicId AND client_id = :clientId`,
    r,
    transaction,
  );
  return rows;
}

/** Removes the blob rows no other recording still points at, and returns their storage keys. */
export async function deleteUnreferencedBlobs(
  sequelize: Sequelize,
  clinicId: string,
  hashes: string[],
  transaction: Transaction,
) {
  if (hashes.length === 0) return [];
  return selectRows<{ storage_key: string | null }>(
    sequelize,
    `DELETE FROM clip_blobs b WHERE b.clinic_id = :clinicId AND b.sha256 IN (:hashes)
       AND NOT EXISTS (SELECT 1 FROM site_recordings r WHERE r.clip_sha256 = b.sha256 AND r.clinic_id = b.clinic_id)
     RETURNING b.storage_key`,
    { clinicId, hashes },
    transaction,
  );
}

export const insertErasure = (
  sequelize: Sequelize,
  row: { id: string; clinicId: string; clientId: string; requestedBy: string; blobsDeleted: number },
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `INSERT INTO client_erasures (id, clinic_id, client_id, requested_by, tombstoned_at, blobs_deleted)
     VALUES (:id, :clinicId, :clientId, :requestedBy, now(), :blobsDeleted)`,
    row,
    transaction,
  );

/**
 * Records, in the erasure's transaction, each blob whose bytes must go: the row stays until the blob store
 * confirms the delete, so a crash or a store outage after the commit is retried instead of forgotten.
 */
export async function queueBlobDeletions(
  sequelize: Sequelize,
  row: { clinicId: string; erasureId: string; storageKeys: string[] },
  transaction: Transaction,
): Promise<void> {
  if (row.storageKeys.length === 0) return;
  await execute(
    sequelize,
    `INSERT INTO blob_deletions (storage_key, clinic_id, erasure_id)
     SELECT unnest(ARRAY[:storageKeys]::text[]), :clinicId, :erasureId ON CONFLICT (storage_key) DO NOTHING`,
    row,
    transaction,
  );
}

/** Blob deletes still waiting, with whether a clip row (of any clinic) still needs the bytes. */
export const pendingBlobDeletions = (
  sequelize: Sequelize,
  filter: { erasureId?: string; clinicId?: string },
) =>
  selectRows<{ storage_key: string; still_needed: boolean }>(
    sequelize,
    `SELECT d.storage_key, EXISTS (SELECT 1 FROM clip_blobs b WHERE b.storage_key = d.storage_key) AS still_needed
     FROM blob_deletions d
     WHERE (:erasureId::uuid IS NULL OR d.erasure_id = :erasureId) AND (:clinicId::uuid IS NULL OR d.clinic_id = :clinicId)
     ORDER BY d.created_at`,
    { erasureId: filter.erasureId ?? null, clinicId: filter.clinicId ?? null },
  );

export const blobDeletionDone = (sequelize: Sequelize, storageKey: string) =>
  execute(sequelize, `DELETE FROM blob_deletions WHERE storage_key = :storageKey`, { storageKey });

export const blobDeletionFailed = (sequelize: Sequelize, storageKey: string, error: string) =>
  execute(
    sequelize,
    `UPDATE blob_deletions SET attempts = attempts + 1, last_error = :error, updated_at = now() WHERE storage_key = :storageKey`,
    { storageKey, error },
  );

/** The second step: once devices have had time to pull the tombstones, the rows themselves go. */
export async function purgeErasedClients(
  sequelize: Sequelize,
  tombstonedBefore: Date,
  transaction: Transaction,
  clinicId?: string,
) {
  const due = await selectRows<{ id: string; client_id: string; clinic_id: string }>(
    sequelize,
    `SELECT id, client_id, clinic_id FROM client_erasures WHERE purged_at IS NULL AND tombstoned_at <= :tombstonedBefore
       AND (:clinicId::uuid IS NULL OR clinic_id = :clinicId) FOR UPDATE SKIP LOCKED`,
    { tombstonedBefore, clinicId: clinicId ?? null },
    transaction,
  );
  for (const erasure of due) {
    await execute(
      sequelize,
      `DELETE FROM clients WHERE id = :clientId AND clinic_id = :clinicId AND deleted_at IS NOT NULL`,
      {
        clientId: erasure.client_id,
        clinicId: erasure.clinic_id,
      },
      transaction,
    );
    await execute(
      sequelize,
      `UPDATE client_erasures SET purged_at = now(), updated_at = now() WHERE id = :id`,
      { id: erasure.id },
      transaction,
    );
  }
  return due;
}
