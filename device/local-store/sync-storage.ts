import { INITIAL_CHECKPOINT, type PulledRow, type RowData, type SyncEntity } from '@/shared/protocol/sync';
import type { OutboxItem, OutboxItemPatch, SyncStorage } from '@/shared/sync/storage';
import { read, transaction, write } from './database';
import { showClient, showConsentsOf } from './mirror';
import { listOutbox, readSealedBlob, updateOutboxItem } from './outbox';

const checkpointKey = 'sync.checkpoint';

// Server-derived fields change a row without bumping its version, so the change sequence breaks ties.
function newer(
  row: { version: number; changeSeq: string },
  than: { version: number; change_seq: string } | null,
): boolean {
  if (!than) return true;
  if (row.version !== than.version) return row.version > than.version;
  return BigInt(row.changeSeq) > BigInt(than.change_seq);
}

const versionedTables: Partial<Record<SyncEntity, string>> = {
  clients: 'clients',
  consents: 'consents',
  recording_sessions: 'sessions',
  site_recordings: 'site_recordings',
};

/** The sync engine's storage over the device's expo-sqlite database; each method is one transaction. */
export class LocalSyncStorage implements SyncStorage {
  listOutbox(): Promise<OutboxItem[]> {
    return listOutbox().then((rows) =>
      rows.map(
        ({
          label: _label,
          clientId: _client,
          sessionId: _session,
          clientName: _name,
          site: _site,
          ...item
        }) => item,
      ),
    );
  }

  putOutboxItem(item: OutboxItem): Promise<void> {
    return write(async (db) => {
      await db.runAsync(
        `INSERT INTO outbox (id, kind, entity, row_id, mutation_json, blob_hash, size_bytes, state, attempts, last_error,
           next_attempt_at, progress, created_at, upload_url, conflict_id)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
         ON CONFLICT(id) DO UPDATE SET kind = excluded.kind, entity = excluded.entity, row_id = excluded.row_id,
           mutation_json = excluded.mutation_json, blob_hash = excluded.blob_hash, size_bytes = excluded.size_bytes,
           state = excluded.state, attempts = excluded.attempts, last_error = excluded.last_error,
           next_attempt_at = excluded.next_attempt_at, progress = excluded.progress, created_at = excluded.created_at,
           upload_url = excluded.upload_url, conflict_id = excluded.conflict_id`,
        item.id,
        item.kind,
        item.entity ?? null,
        item.rowId,
        item.mutation ? JSON.stringify(item.mutation) : null,
        item.blobHash ?? null,
        item.sizeBytes,
        item.state,
        item.attempts,
        item.lastError ?? null,
        item.nextAttemptAt,
        item.progress,
        item.createdAt,
        item.uploadUrl ?? null,
        item.conflictId ?? null,
      );
    });
  }

  updateOutboxItem(id: string, patch: OutboxItemPatch): Promise<void> {
    return updateOutboxItem(id, patch);
  }

  getCheckpoint(): Promise<string> {
    return read(async (db) => {
      const row = await db.getFirstAsync<{ value: string }>(
        'SELECT value FROM kv WHERE key = ?',
        checkpointKey,
      );
      return row?.value ?? INITIAL_CHECKPOINT;
    });
  }

  setCheckpoint(checkpoint: string): Promise<void> {
    return write(async (db) => {
      await db.runAsync(
        'INSERT INTO kv (key, value) VALUES (?, ?) ON CONFLICT(key) DO UPDATE SET value = excluded.value',
        checkpointKey,
        checkpoint,
      );
    });
  }

  applyPulledRows(rows: PulledRow[]): Promise<void> {
    return transaction(async (db) => {
      for (const row of rows) {
        const existing = await db.getFirstAsync<{ version: number; change_seq: string }>(
          'SELECT version, change_seq FROM synced_rows WHERE entity = ? AND id = ?',
          row.entity,
          row.id,
        );
        if (!newer(row, existing)) continue;
        await db.runAsync(
          `INSERT INTO synced_rows (entity, id, version, change_seq, deleted_at, data_json) VALUES (?, ?, ?, ?, ?, ?)
           ON CONFLICT(entity, id) DO UPDATE SET version = excluded.version, change_seq = excluded.change_seq,
             deleted_at = excluded.deleted_at, data_json = excluded.data_json`,
          row.entity,
          row.id,
          row.version,
          row.changeSeq,
          row.deletedAt,
          // A tombstone keeps no data: an erased client's name must not outlive them on the phone.
          row.deletedAt ? '{}' : JSON.stringify(row.data),
        );
        if (row.entity === 'clients') await showClient(db, row);
        const clientId = row.data.clientId;
        if (row.entity === 'consents' && row.deletedAt)
          await db.runAsync('UPDATE consents SET deleted_at = ? WHERE id = ?', row.deletedAt, row.id);
        else if (row.entity === 'consents' && typeof clientId === 'string')
          await showConsentsOf(db, clientId);
      }
    });
  }

  recordAcknowledged(ack: {
    entity: SyncEntity;
    rowId: string;
    newVersion: number;
    change: RowData;
  }): Promise<void> {
    return transaction(async (db) => {
      const existing = await db.getFirstAsync<{
        version: number;
        data_json: string;
        change_seq: string;
        deleted_at: string | null;
      }>(
        'SELECT version, data_json, change_seq, deleted_at FROM synced_rows WHERE entity = ? AND id = ?',
        ack.entity,
        ack.rowId,
      );
      if (existing && existing.version >= ack.newVersion) return;
      const { deletedAt, ...fields } = ack.change;
      const data = { ...(existing ? (JSON.parse(existing.data_json) as RowData) : {}), ...fields };
      await db.runAsync(
        `INSERT INTO synced_rows (entity, id, version, change_seq, deleted_at, data_json) VALUES (?, ?, ?, ?, ?, ?)
         ON CONFLICT(entity, id) DO UPDATE SET version = excluded.version, deleted_at = excluded.deleted_at, data_json = excluded.data_json`,
        ack.entity,
        ack.rowId,
        ack.newVersion,
        existing?.change_seq ?? '0',
        typeof deletedAt === 'string' ? deletedAt : (existing?.deleted_at ?? null),
        JSON.stringify(data),
      );
      const table = versionedTables[ack.entity];
      // Later local edits are based on the version the server now holds.
      if (table)
        await db.runAsync(
          `UPDATE ${table} SET version = ? WHERE id = ? AND version < ?`,
          ack.newVersion,
          ack.rowId,
          ack.newVersion,
        );
    });
  }

  readBlob(sha256: string): Promise<Uint8Array | null> {
    return readSealedBlob(sha256);
  }
}

export const localSyncStorage = new LocalSyncStorage();
