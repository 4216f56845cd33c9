import type { SQLiteDatabase } from 'expo-sqlite';
import type { RowData } from '@/shared/protocol/sync';

// What a pull changes in the tables the operator's screens read. The pulled rows themselves are kept in
// synced_rows; these mirror the clinic's clients and their consents, so the phone lists and records every client
// offline, and an erased client leaves the phone entirely.

const str = (v: unknown): string | null => (typeof v === 'string' ? v : null);

async function waitingLocally(db: SQLiteDatabase, entity: string, id: string): Promise<boolean> {
  const row = await db.getFirstAsync<{ n: number }>(
    "SELECT count(*) AS n FROM outbox WHERE entity = ? AND row_id = ? AND state IN ('waiting', 'sending')",
    entity,
    id,
  );
  return Boolean(row?.n);
}

/** Mirrors a confirmed client, unless a local edit is waiting; a tombstone erases them from the phone. */
export async function showClient(
  db: SQLiteDatabase,
  row: { id: string; version: number; deletedAt: string | null; data: RowData; updatedAt: string },
): Promise<void> {
  if (row.deletedAt) return eraseClientFromDevice(db, row.id);
  if (await waitingLocally(db, 'clients', row.id)) return;
  await db.runAsync(
    `INSERT INTO clients (id, first_name, last_name, date_of_birth, email, phone, origin, version, created_at, updated_at)
     VALUES (?, ?, ?, ?, ?, ?, 'server', ?, ?, ?)
     ON CONFLICT(id) DO UPDATE SET first_name = excluded.first_name, last_name = excluded.last_name,
       date_of_birth = excluded.date_of_birth, email = excluded.email, phone = excluded.phone,
       version = excluded.version, updated_at = excluded.updated_at, deleted_at = NULL`,
    row.id,
    str(row.data.firstName) ?? '',
    str(row.data.lastName) ?? '',
    str(row.data.dateOfBirth),
    str(row.data.email),
    str(row.data.phone),
    row.version,
    row.updatedAt,
    row.updatedAt,
  );
  await showConsentsOf(db, row.id);
}

/**
 * Mirrors the clinic's consents of a client kept on the phone. Pulls run in change order, so a consent can
 * arrive before its client's latest change; it waits in synced_rows and is shown with the client.
 */
export async function showConsentsOf(db: SQLiteDatabase, clientId: string): Promise<void> {
  const client = await db.getFirstAsync<{ id: string }>(
    'SELECT id FROM clients WHERE id = ? AND deleted_at IS NULL',
    clientId,
  );
  if (!client) return;
  const consents = await db.getAllAsync<{
    id: string;
    version: number;
    deleted_at: string | null;
    data_json: string;
  }>(
    "SELECT id, version, deleted_at, data_json FROM synced_rows WHERE entity = 'consents' AND json_extract(data_json, '$.clientId') = ?",
    clientId,
  );
  for (const consent of consents) {
    if (await waitingLocally(db, 'consents', consent.id)) continue;
    const data = JSON.parse(consent.data_json) as RowData;
    const signedOn = str(data.consentDate);
    const textVersion = data.consentTextVersion;
    if (!signedOn || typeof textVersion !== 'number') continue;
    // A version of 1 or more marks the consent as the clinic's: finishing a session does not send it back.
    await db.runAsync(
      `INSERT INTO consents (id, client_id, signed_name, signed_on, text_version, version, created_at, updated_at, deleted_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)
       ON CONFLICT(id) DO UPDATE SET signed_name = excluded.signed_name, signed_on = excluded.signed_on,
         text_version = excluded.text_version, version = excluded.version, deleted_at = excluded.deleted_at`,
      consent.id,
      clientId,
      str(data.typedName) ?? '',
      signedOn,
      String(textVersion),
      Math.max(1, consent.version),
      signedOn,
      signedOn,
      consent.deleted_at,
    );
  }
}

/**
 * The clinic erased (or deleted) the client: their rows, sealed clips, queued items and copies of pulled rows
 * leave the phone, so no page names them (secure_delete zeroes the freed cells). The client's own tombstone stays,
 * without data, so the same pull page applied again changes nothing.
 */
export async function eraseClientFromDevice(db: SQLiteDatabase, clientId: string): Promise<void> {
  const sessionIds = (
    await db.getAllAsync<{ id: string }>(
      `SELECT id FROM sessions WHERE client_id = ?
       UNION SELECT id FROM synced_rows WHERE entity = 'recording_sessions' AND json_extract(data_json, '$.clientId') = ?`,
      clientId,
      clientId,
    )
  ).map((r) => r.id);
  const inSessions = `(${sessionIds.map(() => '?').join(', ') || 'NULL'})`;
  const recordings = await db.getAllAsync<{ id: string; blob_hash: string | null }>(
    `SELECT id, blob_hash FROM site_recordings WHERE session_id IN ${inSessions}`,
    ...sessionIds,
  );
  const recordingIds = recordings.map((r) => r.id);
  const inRecordings = `(${recordingIds.map(() => '?').join(', ') || 'NULL'})`;
  const consentIds = (
    await db.getAllAsync<{ id: string }>(
      `SELECT id FROM consents WHERE client_id = ?
       UNION SELECT id FROM synced_rows WHERE entity = 'consents' AND json_extract(data_json, '$.clientId') = ?`,
      clientId,
      clientId,
    )
  ).map((r) => r.id);
  const inConsents = `(${consentIds.map(() => '?').join(', ') || 'NULL'})`;
  const rowIds = [clientId, ...consentIds, ...sessionIds, ...recordingIds];

  await db.runAsync(
    `DELETE FROM outbox WHERE client_id = ? OR row_id IN (${rowIds.map(() => '?').join(', ')})`,
    clientId,
    ...rowIds,
  );
  for (const { blob_hash: hash } of recordings)
    if (hash) await db.runAsync('DELETE FROM sealed_blobs WHERE hash = ?', hash);
  await db.runAsync(`DELETE FROM site_recordings WHERE id IN ${inRecordings}`, ...recordingIds);
  await db.runAsync(`DELETE FROM sessions WHERE id IN ${inSessions}`, ...sessionIds);
  await db.runAsync(`DELETE FROM consents WHERE id IN ${inConsents}`, ...consentIds);
  await db.runAsync('DELETE FROM clients WHERE id = ?', clientId);
  await db.runAsync(
    `DELETE FROM synced_rows WHERE (entity = 'consents' AND id IN ${inConsents})
       OR (entity = 'recording_sessions' AND id IN ${inSessions})
       OR (entity = 'site_recordings' AND (id IN ${inRecordings} OR json_extract(data_json, '$.sessionId') IN ${inSessions}))`,
    ...consentIds,
    ...sessionIds,
    ...recordingIds,
    ...sessionIds,
  );
  await db.runAsync("UPDATE synced_rows SET data_json = '{}' WHERE entity = 'clients' AND id = ?", clientId);
}
