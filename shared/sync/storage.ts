import type { Mutation, PulledRow, RowData, SyncEntity } from '@/shared/protocol/sync';

export type OutboxState = 'waiting' | 'sending' | 'sent' | 'failed' | 'conflict';
export type OutboxKind = 'mutation' | 'clip';

/**
 * One queued thing to send. States: waiting (to go, possibly after a retryable error: see lastError and
 * nextAttemptAt), sending, sent (the server acknowledged it), failed (the server refused it for good; lastError
 * says why), conflict (the server kept it in a conflict record for an admin).
 */
export interface OutboxItem {
  id: string;
  kind: OutboxKind;
  entity?: SyncEntity;
  rowId: string;
  mutation?: Mutation;
  /** sha256 (hex) of the sealed clip bytes. */
  blobHash?: string;
  sizeBytes: number;
  state: OutboxState;
  attempts: number;
  lastError?: string;
  /** Epoch milliseconds; the engine does not send the item before then. */
  nextAttemptAt: number;
  /** 0..1; clips move through it while uploading, rows jump to 1 when acknowledged. */
  progress: number;
  /** Epoch milliseconds; the outbox drains in this order. */
  createdAt: number;
  /** The resumable-upload URL the server gave, so a reload resumes from the stored offset. */
  uploadUrl?: string;
  conflictId?: string;
}

export type OutboxItemPatch = Partial<Omit<OutboxItem, 'id' | 'kind' | 'createdAt'>>;

/**
 * What the sync engine needs from a device's local store. The app implements it over expo-sqlite
 * (device/local-store); tests and simulated devices use MemorySyncStorage. Every method is one atomic step.
 */
export interface SyncStorage {
  /** Items in createdAt order (ties by id). */
  listOutbox(): Promise<OutboxItem[]>;
  /** Insert or replace by id. */
  putOutboxItem(item: OutboxItem): Promise<void>;
  updateOutboxItem(id: string, patch: OutboxItemPatch): Promise<void>;
  /** The last pull checkpoint stored; INITIAL_CHECKPOINT ('0') before the first pull. */
  getCheckpoint(): Promise<string>;
  setCheckpoint(checkpoint: string): Promise<void>;
  /**
   * Store rows from the server (tombstones included: deletedAt set). A row replaces the local copy when its
   * version or changeSeq is newer; applying the same page twice changes nothing. Local changes still waiting in
   * the outbox stay on top of what is shown.
   */
  applyPulledRows(rows: PulledRow[]): Promise<void>;
  /**
   * The server applied this change to the row, which now has this version: the confirmed copy takes the change
   * (when newVersion is newer than it), and new local edits of the row are based on that version, so a device's
   * own writes never come back to it as conflicts.
   */
  recordAcknowledged(ack: {
    entity: SyncEntity;
    rowId: string;
    newVersion: number;
    change: RowData;
  }): Promise<void>;
  /** The sealed bytes of a queued clip, or null when they are gone. */
  readBlob(sha256: string): Promise<Uint8Array | null>;
}
