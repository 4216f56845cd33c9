import { v4 as uuid } from 'uuid';
import type { SQLiteDatabase } from 'expo-sqlite';
import { read, write } from './database';
import type { Mutation, SyncEntity } from '@/shared/protocol/sync';
import type { OutboxItemPatch } from '@/shared/sync/storage';
import type { UnsentSummary } from '@/device/sync/sync-context';
import type { OutboxItem, OutboxRow, OutboxState } from './records';

type OutboxDbRow = {
  id: string;
  kind: OutboxItem['kind'];
  entity: string | null;
  row_id: string;
  mutation_json: string | null;
  blob_hash: string | null;
  size_bytes: number;
  state: OutboxState;
  attempts: number;
  last_error: string | null;
  next_attempt_at: number;
  progress: number;
  created_at: number;
  upload_url: string | null;
  conflict_id: string | null;
  label: string | null;
  client_id: string | null;
  session_id: string | null;
  client_name?: string | null;
  site?: string | null;
};

export function toOutboxRow(row: OutboxDbRow): OutboxRow {
  return {
    id: row.id,
    kind: row.kind,
    ...(row.entity ? { entity: row.entity as SyncEntity } : {}),
    rowId: row.row_id,
    ...(row.mutation_json ? { mutation: JSON.parse(row.mutation_json) as Mutation } : {}),
    ...(row.blob_hash ? { blobHash: row.blob_hash } : {}),
    sizeBytes: row.size_bytes,
    state: row.state,
    attempts: row.attempts,
    ...(row.last_error ? { lastError: row.last_error } : {}),
    nextAttemptAt: row.next_attempt_at,
    progress: row.progress,
    createdAt: row.created_at,
    ...(row.upload_url ? { uploadUrl: row.upload_url } : {}),
    ...(row.conflict_id ? { conflictId: row.conflict_id } : {}),
    label: row.label,
    clientId: row.client_id,
    sessionId: row.session_id,
    clientName: row.client_name ?? null,
    site: (row.site as OutboxRow['site']) ?? null,
  };
}

export type NewOutboxItem = Omit<
  OutboxItem,
  'id' | 'state' | 'attempts' | 'nextAttemptAt' | 'progress' | 'createdAt' | 'uploadUrl' | 'conflictId'
> & {
  /** What the item is, in words and without the client's name (the name is read from the client row). */
  label: string;
  clientId: string;
  sessionId: string | null;
};

/**
 * Inserts inside the caller's transaction, so queueing and the change it carries land together. The queue drains
 * in createdAt order, and parents must reach the server before their children, so `order` spaces items queued in
 * the same instant a millisecond apart.
 */
export async function enqueue(
  db: SQLiteDatabase,
  item: NewOutboxItem,
  now: Date,
  order = 0,
): Promise<string> {
  const id = uuid();
  const at = now.getTime() + order;
  await db.runAsync(
    `INSERT INTO outbox (id, kind, entity, row_id, mutation_json, blob_hash, size_bytes, state, attempts, next_attempt_at,
       progress, created_at, label, client_id, session_id)
     VALUES (?, ?, ?, ?, ?, ?, ?, 'waiting', 0, ?, 0, ?, ?, ?, ?)`,
    id,
    item.kind,
    item.entity ?? null,
    item.rowId,
    item.mutation === undefined ? null : JSON.stringify(item.mutation),
    item.blobHash ?? null,
    item.sizeBytes,
    at,
    at,
    item.label,
    item.clientId,
    item.sessionId,
  );
  return id;
}

/** The queue in drain order, each item with its client's name and site read from the rows it belongs to. */
export function listOutbox(): Promise<OutboxRow[]> {
  return read(async (db) => {
    const rows = await db.getAllAsync<OutboxDbRow>(
      `SELECT outbox.*, clients.first_name || ' ' || clients.last_name AS client_name, site_recordings.site AS site
       FROM outbox
       LEFT JOIN clients ON clients.id = outbox.client_id
       LEFT JOIN site_recordings ON site_recordings.id = outbox.row_id
         AND (outbox.entity = 'site_recordings' OR outbox.kind = 'clip')
       ORDER BY outbox.created_at, outbox.id`,
    );
    return rows.map(toOutboxRow);
  });
}

/** Items still to deliver or needing attention: everything not yet sent. */
export function pendingOutboxCount(): Promise<number> {
  return read(async (db) => {
    const row = await db.getFirstAsync<{ n: number }>(
      "SELECT count(*) AS n FROM outbox WHERE state <> 'sent'",
    );
    return row?.n ?? 0;
  });
}

/** What would wait on this phone if the operator signed out now. */
export function unsentSummary(): Promise<UnsentSummary> {
  return read(async (db) => {
    const row = await db.getFirstAsync<UnsentSummary>(
      `SELECT count(*) AS items, coalesce(sum(kind = 'clip'), 0) AS recordings,
         count(DISTINCT session_id) AS sessions, count(DISTINCT client_id) AS clients
       FROM outbox WHERE state <> 'sent'`,
    );
    return row ?? { items: 0, recordings: 0, sessions: 0, clients: 0 };
  });
}

export function readSealedBlob(hash: string): Promise<Uint8Array | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<{ bytes: Uint8Array }>(
      'SELECT bytes FROM sealed_blobs WHERE hash = ?',
      hash,
    );
    return row ? new Uint8Array(row.bytes) : null;
  });
}

const patchColumns: Record<keyof OutboxItemPatch, string> = {
  entity: 'entity',
  rowId: 'row_id',
  mutation: 'mutation_json',
  blobHash: 'blob_hash',
  sizeBytes: 'size_bytes',
  state: 'state',
  attempts: 'attempts',
  lastError: 'last_error',
  nextAttemptAt: 'next_attempt_at',
  progress: 'progress',
  uploadUrl: 'upload_url',
  conflictId: 'conflict_id',
};

export function updateOutboxItem(id: string, patch: OutboxItemPatch): Promise<void> {
  return write(async (db) => {
    const sets: string[] = [];
    const values: (string | number | null)[] = [];
    for (const [field, column] of Object.entries(patchColumns) as [keyof OutboxItemPatch, string][]) {
      if (!(field in patch)) continue;
      const value = patch[field];
      sets.push(`${column} = ?`);
      values.push(
        value === undefined
          ? null
          : field === 'mutation'
            ? JSON.stringify(value)
            : (value as string | number),
      );
    }
    if (sets.length === 0) return;
    const result = await db.runAsync(`UPDATE outbox SET ${sets.join(', ')} WHERE id = ?`, ...values, id);
    if (result.changes === 0) throw new Error(`No outbox item ${id}`);
  });
}
