import { v4 as uuid } from 'uuid';
import type { SQLiteDatabase } from 'expo-sqlite';
import { read, write } from './database';
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
  created_at: string;
  label: string | null;
};

export function toOutboxRow(row: OutboxDbRow): OutboxRow {
  return {
    id: row.id,
    kind: row.kind,
    ...(row.entity ? { entity: row.entity } : {}),
    rowId: row.row_id,
    ...(row.mutation_json ? { mutation: JSON.parse(row.mutation_json) as unknown } : {}),
    ...(row.blob_hash ? { blobHash: row.blob_hash } : {}),
    sizeBytes: row.size_bytes,
    state: row.state,
    attempts: row.attempts,
    ...(row.last_error ? { lastError: row.last_error } : {}),
    nextAttemptAt: row.next_attempt_at,
    progress: row.progress,
    createdAt: row.created_at,
    label: row.label,
  };
}

export type NewOutboxItem = Omit<OutboxItem, 'id' | 'state' | 'attempts' | 'nextAttemptAt' | 'progress' | 'createdAt'> & {
  label: string;
};

/** Inserts inside the caller's transaction, so queueing and the change it carries land together. */
export async function enqueue(db: SQLiteDatabase, item: NewOutboxItem, now: Date): Promise<string> {
  const id = uuid();
  await db.runAsync(
    `INSERT INTO outbox (id, kind, entity, row_id, mutation_json, blob_hash, size_bytes, state, attempts, next_attempt_at,
       progress, created_at, label)
     VALUES (?, ?, ?, ?, ?, ?, ?, 'waiting', 0, ?, 0, ?, ?)`,
    id,
    item.kind,
    item.entity ?? null,
    item.rowId,
    item.mutation === undefined ? null : JSON.stringify(item.mutation),
    item.blobHash ?? null,
    item.sizeBytes,
    now.getTime(),
    now.toISOString(),
    item.label,
  );
  return id;
}

export function listOutbox(): Promise<OutboxRow[]> {
  return read(async (db) => {
    const rows = await db.getAllAsync<OutboxDbRow>('SELECT * FROM outbox ORDER BY created_at, rowid');
    return rows.map(toOutboxRow);
  });
}

/** Items still to deliver or needing attention: everything not yet sent. */
export function pendingOutboxCount(): Promise<number> {
  return read(async (db) => {
    const row = await db.getFirstAsync<{ n: number }>("SELECT count(*) AS n FROM outbox WHERE state <> 'sent'");
    return row?.n ?? 0;
  });
}

export function readSealedBlob(hash: string): Promise<Uint8Array | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<{ bytes: Uint8Array }>('SELECT bytes FROM sealed_blobs WHERE hash = ?', hash);
    return row ? new Uint8Array(row.bytes) : null;
  });
}

export function updateOutboxItem(
  id: string,
  change: Partial<Pick<OutboxItem, 'state' | 'attempts' | 'lastError' | 'nextAttemptAt' | 'progress'>>,
): Promise<void> {
  return write(async (db) => {
    const sets: string[] = [];
    const values: (string | number | null)[] = [];
    if (change.state !== undefined) (sets.push('state = ?'), values.push(change.state));
    if (change.attempts !== undefined) (sets.push('attempts = ?'), values.push(change.attempts));
    if ('lastError' in change) (sets.push('last_error = ?'), values.push(change.lastError ?? null));
    if (change.nextAttemptAt !== undefined) (sets.push('next_attempt_at = ?'), values.push(change.nextAttemptAt));
    if (change.progress !== undefined) (sets.push('progress = ?'), values.push(change.progress));
    if (sets.length === 0) return;
    await db.runAsync(`UPDATE outbox SET ${sets.join(', ')} WHERE id = ?`, ...values, id);
  });
}
