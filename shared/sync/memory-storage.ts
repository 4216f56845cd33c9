import type { PulledRow, RowData, SyncEntity } from '@/shared/protocol/sync';
import { INITIAL_CHECKPOINT } from '@/shared/protocol/sync';
import type { OutboxItem, OutboxItemPatch, SyncStorage } from './storage';

export interface LocalRow {
  entity: SyncEntity;
  id: string;
  /** The last version the server confirmed (pulled or acknowledged); 0 for a row the server has not seen. */
  version: number;
  changeSeq: string;
  deletedAt: string | null;
  data: RowData;
}

const key = (entity: SyncEntity, id: string) => `${entity}:${id}`;
const clone = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

// Server-derived fields change a row without bumping its version, so the change sequence breaks ties.
export function isNewer(
  row: { version: number; changeSeq: string },
  than: { version: number; changeSeq: string },
): boolean {
  if (row.version !== than.version) return row.version > than.version;
  return BigInt(row.changeSeq) > BigInt(than.changeSeq);
}

/** A SyncStorage in memory, for tests and the simulated devices of the fault tests and the benchmark. */
export class MemorySyncStorage implements SyncStorage {
  private readonly outbox = new Map<string, OutboxItem>();
  private readonly rows = new Map<string, LocalRow>();
  private readonly blobs = new Map<string, Uint8Array>();
  private checkpoint = INITIAL_CHECKPOINT;
  /** Count of pulled rows applied, for tests that check a page is not stored twice. */
  pulledRowsApplied = 0;

  async listOutbox(): Promise<OutboxItem[]> {
    return [...this.outbox.values()]
      .sort((a, b) => a.createdAt - b.createdAt || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0))
      .map(clone);
  }

  async putOutboxItem(item: OutboxItem): Promise<void> {
    this.outbox.set(item.id, clone(item));
  }

  async updateOutboxItem(id: string, patch: OutboxItemPatch): Promise<void> {
    const item = this.outbox.get(id);
    if (!item) throw new Error(`No outbox item ${id}`);
    this.outbox.set(id, { ...item, ...clone(patch) });
  }

  async getCheckpoint(): Promise<string> {
    return this.checkpoint;
  }

  async setCheckpoint(checkpoint: string): Promise<void> {
    this.checkpoint = checkpoint;
  }

  async applyPulledRows(rows: PulledRow[]): Promise<void> {
    for (const row of rows) {
      this.pulledRowsApplied++;
      const existing = this.rows.get(key(row.entity, row.id));
      if (existing && !isNewer(row, existing)) continue;
      this.rows.set(key(row.entity, row.id), {
        entity: row.entity,
        id: row.id,
        version: row.version,
        changeSeq: row.changeSeq,
        deletedAt: row.deletedAt,
        data: clone(row.data),
      });
    }
  }

  async recordAcknowledged(ack: {
    entity: SyncEntity;
    rowId: string;
    newVersion: number;
    change: RowData;
  }): Promise<void> {
    const existing = this.rows.get(key(ack.entity, ack.rowId));
    if (existing && existing.version >= ack.newVersion) return;
    const { deletedAt, ...fields } = clone(ack.change);
    this.rows.set(key(ack.entity, ack.rowId), {
      entity: ack.entity,
      id: ack.rowId,
      version: ack.newVersion,
      changeSeq: existing?.changeSeq ?? '0',
      deletedAt: typeof deletedAt === 'string' ? deletedAt : (existing?.deletedAt ?? null),
      data: { ...(existing?.data ?? {}), ...fields },
    });
  }

  async readBlob(sha256: string): Promise<Uint8Array | null> {
    return this.blobs.get(sha256) ?? null;
  }

  putBlob(sha256: string, bytes: Uint8Array): void {
    this.blobs.set(sha256, bytes);
  }

  /** The server's confirmed copy, without local changes. */
  confirmedRow(entity: SyncEntity, id: string): LocalRow | undefined {
    const row = this.rows.get(key(entity, id));
    return row && clone(row);
  }

  /** What the device shows: the confirmed row with changes still in the outbox on top. */
  async localRow(entity: SyncEntity, id: string): Promise<LocalRow | undefined> {
    const row = this.confirmedRow(entity, id);
    const pending = (await this.listOutbox()).filter(
      (i) =>
        i.kind === 'mutation' &&
        i.entity === entity &&
        i.rowId === id &&
        (i.state === 'waiting' || i.state === 'sending'),
    );
    if (!row && pending.length === 0) return undefined;
    const shown: LocalRow = row ?? { entity, id, version: 0, changeSeq: '0', deletedAt: null, data: {} };
    for (const item of pending) {
      const { deletedAt, ...fields } = item.mutation?.change ?? {};
      Object.assign(shown.data, fields);
      if (typeof deletedAt === 'string') shown.deletedAt = deletedAt;
    }
    return shown;
  }

  /** The version new local edits of this row are based on. */
  baseVersionOf(entity: SyncEntity, id: string): number {
    return this.rows.get(key(entity, id))?.version ?? 0;
  }

  allConfirmedRows(): LocalRow[] {
    return [...this.rows.values()].map(clone);
  }
}
