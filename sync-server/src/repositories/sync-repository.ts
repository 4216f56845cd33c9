import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  serverOwnedFields,
  syncEntities,
  syncFieldSchemas,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';

// Two-integer advisory lock class shared with the change-sequence trigger (see the sync-pull-guard migration).
const SYNC_LOCK_CLASS = 7301;

const snake = (name: string) => name.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
const camel = (name: string) => name.replace(/_([a-z])/g, (_m, c: string) => c.toUpperCase());

export const deviceFields: Record<SyncEntity, string[]> = Object.fromEntries(
  syncEntities.map((e) => [e, Object.keys(syncFieldSchemas[e].shape)]),
) as Record<SyncEntity, string[]>;

/** Fields a pull carries: what devices write plus what the server fills (the analysis stays on the server). */
const pulledFields: Record<SyncEntity, string[]> = Object.fromEntries(
  syncEntities.map((e) => [e, [...deviceFields[e], ...serverOwnedFields[e].filter((f) => f !== 'analysis')]]),
) as Record<SyncEntity, string[]>;

/** Parent rows a change may point at: field -> table. */
export const parentsOf: Record<SyncEntity, Record<string, string>> = {
  clients: {},
  consents: { clientId: 'clients', consentTextId: 'consent_texts' },
  recording_sessions: { clientId: 'clients' },
  site_recordings: { sessionId: 'recording_sessions' },
};

export interface StoredRow {
  id: string;
  clinicId: string;
  version: number;
  changeSeq: string;
  updatedAt: string;
  deletedAt: string | null;
  data: RowData;
}

type Raw = Record<string, unknown>;

export interface MutationRecord {
  mutationId: string;
  clinicId: string;
  userId: string;
  deviceId: string;
  entity: SyncEntity;
  rowId: string;
  result: Raw;
}

const iso = (value: unknown): string | null =>
  value === null || value === undefined ? null : value instanceof Date ? value.toISOString() : String(value);

function toStored(entity: SyncEntity, raw: Raw, fields = pulledFields[entity]): StoredRow {
  const data: RowData = {};
  for (const field of fields) {
    const value = raw[snake(field)];
    data[field] = value instanceof Date ? value.toISOString() : (value ?? null);
  }
  return {
    id: String(raw.id),
    clinicId: String(raw.clinic_id),
    version: Number(raw.version),
    changeSeq: String(raw.change_seq),
    updatedAt: iso(raw.updated_at)!,
    deletedAt: iso(raw.deleted_at),
    data,
  };
}

export class SyncRepository {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly transaction?: Transaction,
  ) {}

  private select<T extends object = Raw>(sql: string, bind: unknown[]): Promise<T[]> {
    return this.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: this.transaction });
  }

  private async run(sql: string, bind: unknown[]): Promise<void> {
    await this.sequelize.query(sql, { bind, transaction: this.transaction });
  }

  /** Writers hold this (shared) until commit; see the migration for why. */
  async lockClinicForWrite(clinicId: string): Promise<void> {
    await this.select(`SELECT pg_advisory_xact_lock_shared(${SYNC_LOCK_CLASS}, hashtext($1))`, [clinicId]);
  }

  /**
   * Waits for this clinic's writers in flight, then reads the sequence: every change number up to the answer is
   * committed or rolled back, so a pull can safely move past it. Needs its own short transaction.
   */
  async safeHighWater(clinicId: string): Promise<string> {
    await this.select(`SELECT pg_advisory_xact_lock(${SYNC_LOCK_CLASS}, hashtext($1))`, [clinicId]);
    // A sequence is read outside MVCC, and this second statement runs after the lock was granted.
    const [row] = await this.select<{ high: string }>(
      `SELECT (CASE WHEN is_called THEN last_value ELSE last_value - 1 END)::text AS high FROM sync_change_seq`,
      [],
    );
    return row.high;
  }

  async findAppliedMutation(mutationId: string): Promise<{ clinicId: string; result: Raw } | null> {
    const [row] = await this.select<{ clinic_id: string; result: Raw }>(
      `SELECT clinic_id, result FROM applied_mutations WHERE mutation_id = $1`,
      [mutationId],
    );
    return row ? { clinicId: row.clinic_id, result: row.result } : null;
  }

  async recordMutation(args: MutationRecord): Promise<void> {
    await this.run(
      `INSERT INTO applied_mutations (mutation_id, clinic_id, user_id, device_id, entity, row_id, result, applied_at)
       VALUES ($1, $2, $3, $4, $5, $6, $7::jsonb, now())`,
      [
        args.mutationId,
        args.clinicId,
        args.userId,
        args.deviceId,
        args.entity,
        args.rowId,
        JSON.stringify(args.result),
      ],
    );
  }

  /** Savepoints let one mutation of a batch fail alone inside the batch's transaction. */
  async savepoint(name: string): Promise<void> {
    await this.run(`SAVEPOINT ${name}`, []);
  }

  async releaseSavepoint(name: string): Promise<void> {
    await this.run(`RELEASE SAVEPOINT ${name}`, []);
  }

  async rollbackToSavepoint(name: string): Promise<void> {
    await this.run(`ROLLBACK TO SAVEPOINT ${name}`, []);
  }

  /**
   * The usual create in one statement: inserts the row only when its id is free and every parent is a live row
   * of the clinic, and records the mutation with it. False means nothing was written (the caller then finds out
   * why the slow way); a unique or check violation still raises.
   */
  async insertRowRecorded(
    entity: SyncEntity,
    clinicId: string,
    id: string,
    fields: RowData,
    deletedAt: string | null,
    parents: Record<string, string>,
    mutation: MutationRecord,
  ): Promise<boolean> {
    const names = Object.keys(fields);
    const columns = ['id', 'clinic_id', 'version', 'deleted_at', ...names.map(snake)];
    const bind: unknown[] = [id, clinicId, 1, deletedAt, ...names.map((n) => encode(fields[n]))];
    const values = columns.map((_c, i) => `$${i + 1}`);
    const guard = this.parentGuard(fields, parents, clinicId, bind);
    const record = this.recordValues(mutation, bind);
    const rows = await this.select(
      `WITH written AS (
         INSERT INTO ${entity} (${columns.join(', ')}) SELECT ${values.join(', ')} ${guard ? `WHERE ${guard}` : ''}
         ON CONFLICT (id) DO NOTHING RETURNING id)
       INSERT INTO applied_mutations (mutation_id, clinic_id, user_id, device_id, entity, row_id, result, applied_at)
       SELECT ${record} FROM written RETURNING mutation_id`,
      bind,
    );
    return rows.length === 1;
  }

  /**
   * The usual edit in one statement: the version check, the change, the version bump and the mutation record.
   * False means the row is missing, of another clinic, at another version, or a parent is missing.
   */
  async updateRowRecorded(
    entity: SyncEntity,
    clinicId: string,
    id: string,
    fields: RowData,
    deletedAt: string | undefined,
    baseVersion: number,
    parents: Record<string, string>,
    mutation: MutationRecord,
  ): Promise<boolean> {
    const names = Object.keys(fields);
    const bind: unknown[] = [id, clinicId, baseVersion];
    const sets = ['version = version + 1', 'updated_at = now()'];
    for (const n of names) {
      bind.push(encode(fields[n]));
      sets.push(`${snake(n)} = $${bind.length}`);
    }
    if (deletedAt !== undefined) {
      bind.push(deletedAt);
      sets.push(`deleted_at = $${bind.length}`);
    }
    const guard = this.parentGuard(fields, parents, clinicId, bind);
    const record = this.recordValues(mutation, bind);
    const rows = await this.select(
      `WITH written AS (
         UPDATE ${entity} SET ${sets.join(', ')}
         WHERE id = $1 AND clinic_id = $2 AND version = $3 ${guard ? `AND ${guard}` : ''} RETURNING id)
       INSERT INTO applied_mutations (mutation_id, clinic_id, user_id, device_id, entity, row_id, result, applied_at)
       SELECT ${record} FROM written RETURNING mutation_id`,
      bind,
    );
    return rows.length === 1;
  }

  private parentGuard(
    fields: RowData,
    parents: Record<string, string>,
    clinicId: string,
    bind: unknown[],
  ): string {
    const checks: string[] = [];
    for (const [field, table] of Object.entries(parents)) {
      const parentId = fields[field];
      if (typeof parentId !== 'string') continue;
      bind.push(parentId);
      const idParam = `$${bind.length}`;
      bind.push(clinicId);
      const live = table === 'consent_texts' ? '' : 'AND p.deleted_at IS NULL';
      checks.push(
        `EXISTS (SELECT 1 FROM ${table} p WHERE p.id = ${idParam} AND p.clinic_id = $${bind.length} ${live})`,
      );
    }
    return checks.join(' AND ');
  }

  private recordValues(m: MutationRecord, bind: unknown[]): string {
    const start = bind.length;
    bind.push(m.mutationId, m.clinicId, m.userId, m.deviceId, m.entity, m.rowId, JSON.stringify(m.result));
    const p = (i: number) => `$${start + i}`;
    return `${p(1)}::uuid, ${p(2)}::uuid, ${p(3)}::uuid, ${p(4)}::uuid, ${p(5)}, ${p(6)}::uuid, ${p(7)}::jsonb, now()`;
  }

  async lockRow(entity: SyncEntity, id: string): Promise<StoredRow | null> {
    const [raw] = await this.select(`SELECT * FROM ${entity} WHERE id = $1 FOR UPDATE`, [id]);
    return raw ? toStored(entity, raw) : null;
  }

  async findRow(entity: SyncEntity, clinicId: string, id: string): Promise<StoredRow | null> {
    const [raw] = await this.select(`SELECT * FROM ${entity} WHERE id = $1 AND clinic_id = $2`, [
      id,
      clinicId,
    ]);
    return raw ? toStored(entity, raw) : null;
  }

  async parentExists(table: string, clinicId: string, id: string): Promise<boolean> {
    const live = table === 'consent_texts' ? '' : 'AND deleted_at IS NULL';
    const rows = await this.select(`SELECT 1 FROM ${table} WHERE id = $1 AND clinic_id = $2 ${live}`, [
      id,
      clinicId,
    ]);
    return rows.length > 0;
  }

  async insertRow(
    entity: SyncEntity,
    clinicId: string,
    id: string,
    fields: RowData,
    deletedAt: string | null,
  ): Promise<void> {
    const names = Object.keys(fields);
    const columns = ['id', 'clinic_id', 'version', 'deleted_at', ...names.map(snake)];
    const values = [id, clinicId, 1, deletedAt, ...names.map((n) => encode(fields[n]))];
    const placeholders = columns.map((_c, i) => `$${i + 1}`);
    await this.run(
      `INSERT INTO ${entity} (${columns.join(', ')}) VALUES (${placeholders.join(', ')})`,
      values,
    );
  }

  /** A change from a device: the version moves on. */
  async updateRow(
    entity: SyncEntity,
    id: string,
    fields: RowData,
    deletedAt: string | null | undefined,
    newVersion: number,
  ): Promise<void> {
    const names = Object.keys(fields);
    const sets = ['version = $2', 'updated_at = now()', ...names.map((n, i) => `${snake(n)} = $${i + 3}`)];
    const values: unknown[] = [id, newVersion, ...names.map((n) => encode(fields[n]))];
    if (deletedAt !== undefined) {
      values.push(deletedAt);
      sets.push(`deleted_at = $${values.length}`);
    }
    await this.run(`UPDATE ${entity} SET ${sets.join(', ')} WHERE id = $1`, values);
  }

  async insertConflict(args: {
    id: string;
    clinicId: string;
    entity: SyncEntity;
    rowId: string;
    mutationId: string;
    deviceId: string;
    userId: string;
    serverVersion: Raw;
    clientVersion: Raw;
  }): Promise<void> {
    await this.run(
      `INSERT INTO sync_conflicts (id, clinic_id, entity, row_id, mutation_id, device_id, user_id, server_version, client_version, status, created_at, updated_at)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8::jsonb, $9::jsonb, 'open', now(), now())`,
      [
        args.id,
        args.clinicId,
        args.entity,
        args.rowId,
        args.mutationId,
        args.deviceId,
        args.userId,
        JSON.stringify(args.serverVersion),
        JSON.stringify(args.clientVersion),
      ],
    );
  }

  async lastWriterOf(rowId: string): Promise<{ deviceId: string | null; userId: string | null } | null> {
    const [row] = await this.select<{ device_id: string | null; user_id: string | null }>(
      `SELECT device_id, user_id FROM applied_mutations WHERE row_id = $1 AND result->>'status' = 'applied'
       ORDER BY applied_at DESC LIMIT 1`,
      [rowId],
    );
    return row ? { deviceId: row.device_id, userId: row.user_id } : null;
  }

  /** Rows of the clinic with change numbers in (after, upTo], oldest change first, at most `limit`. */
  async changesBetween(
    clinicId: string,
    after: string,
    upTo: string,
    limit: number,
  ): Promise<(StoredRow & { entity: SyncEntity })[]> {
    const parts = syncEntities.map(
      (e) =>
        `(SELECT '${e}' AS entity, to_jsonb(t) AS raw, t.change_seq FROM ${e} t
          WHERE t.clinic_id = $1 AND t.change_seq > $2 AND t.change_seq <= $3 ORDER BY t.change_seq LIMIT $4)`,
    );
    const rows = await this.select<{ entity: SyncEntity; raw: Raw }>(
      `${parts.join(' UNION ALL ')} ORDER BY change_seq LIMIT $4`,
      [clinicId, after, upTo, limit],
    );
    return rows.map((r) => ({ entity: r.entity, ...toStored(r.entity, r.raw) }));
  }

  /** The kept size of a stored clip, or null when this clinic has no stored clip with this hash. */
  async storedClipSize(clinicId: string, sha256: string): Promise<number | null> {
    const [row] = await this.select<{ size_bytes: string }>(
      `SELECT size_bytes FROM clip_blobs WHERE sha256 = $1 AND clinic_id = $2 AND state = 'stored'`,
      [sha256, clinicId],
    );
    return row ? Number(row.size_bytes) : null;
  }

  async clipBlob(
    clinicId: string,
    sha256: string,
  ): Promise<{ state: string; failure: string | null; analysis: unknown } | null> {
    const [row] = await this.select<{ state: string; failure: string | null; analysis: unknown }>(
      `SELECT state, failure, analysis FROM clip_blobs WHERE sha256 = $1 AND clinic_id = $2`,
      [sha256, clinicId],
    );
    return row ?? null;
  }

  async saveClipBlob(args: {
    sha256: string;
    clinicId: string;
    sizeBytes: number;
    /** null for a clip that was refused: its bytes are not kept. */
    storageKey: string | null;
    state: 'stored' | 'failed';
    analysis: unknown;
    failure: string | null;
  }): Promise<void> {
    await this.run(
      `INSERT INTO clip_blobs (sha256, clinic_id, size_bytes, content_type, storage_key, state, analysis, failure, created_at, updated_at)
       VALUES ($1, $2, $3, 'application/x-fourpoint-sealed', $4, $5, $6::jsonb, $7, now(), now())
       ON CONFLICT (sha256) DO UPDATE SET state = EXCLUDED.state, analysis = EXCLUDED.analysis, failure = EXCLUDED.failure,
         storage_key = EXCLUDED.storage_key, updated_at = now()
       WHERE clip_blobs.clinic_id = EXCLUDED.clinic_id`,
      [
        args.sha256,
        args.clinicId,
        args.sizeBytes,
        args.storageKey,
        args.state,
        JSON.stringify(args.analysis ?? null),
        args.failure,
      ],
    );
  }

  /** Server-derived fields: the change number moves (devices pull it) but the version does not. */
  async attachClipToRecordings(
    clinicId: string,
    sha256: string,
    clipState: 'stored' | 'failed',
    analysis: unknown,
  ): Promise<number> {
    const [, affected] = (await this.sequelize.query(
      `UPDATE site_recordings SET clip_state = $3, analysis = $4::jsonb WHERE clinic_id = $1 AND clip_sha256 = $2`,
      {
        bind: [clinicId, sha256, clipState, JSON.stringify(analysis ?? null)],
        transaction: this.transaction,
      },
    )) as [unknown, number];
    return affected ?? 0;
  }

  async setServerFields(entity: SyncEntity, id: string, fields: RowData): Promise<void> {
    const names = Object.keys(fields);
    if (names.length === 0) return;
    const sets = names.map((n, i) => `${snake(n)} = $${i + 2}`);
    await this.run(`UPDATE ${entity} SET ${sets.join(', ')} WHERE id = $1`, [
      id,
      ...names.map((n) => encode(fields[n])),
    ]);
  }
}

function encode(value: unknown): unknown {
  return value !== null && typeof value === 'object' ? JSON.stringify(value) : value;
}

export { camel, snake };
