import type { Mutation, RowData, SyncEntity } from '@/shared/protocol/sync';
import type { OutboxItem } from './storage';

const byteLength = (value: unknown) => new TextEncoder().encode(JSON.stringify(value)).length;

/** A queued row change. `baseVersion` is the version the device last had from the server (0 for a new row). */
export function mutationItem(args: {
  mutationId: string;
  entity: SyncEntity;
  rowId: string;
  baseVersion: number;
  change: RowData;
  now?: number;
}): OutboxItem {
  const mutation: Mutation = {
    mutationId: args.mutationId,
    entity: args.entity,
    id: args.rowId,
    baseVersion: args.baseVersion,
    change: args.change,
  };
  const now = args.now ?? Date.now();
  return {
    id: args.mutationId,
    kind: 'mutation',
    entity: args.entity,
    rowId: args.rowId,
    mutation,
    sizeBytes: byteLength(mutation),
    state: 'waiting',
    attempts: 0,
    nextAttemptAt: now,
    progress: 0,
    createdAt: now,
  };
}

/** A queued sealed clip for a site recording row. */
export function clipItem(args: {
  id: string;
  rowId: string;
  blobHash: string;
  sizeBytes: number;
  now?: number;
}): OutboxItem {
  const now = args.now ?? Date.now();
  return {
    id: args.id,
    kind: 'clip',
    entity: 'site_recordings',
    rowId: args.rowId,
    blobHash: args.blobHash,
    sizeBytes: args.sizeBytes,
    state: 'waiting',
    attempts: 0,
    nextAttemptAt: now,
    progress: 0,
    createdAt: now,
  };
}
