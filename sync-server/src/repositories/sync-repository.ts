import { createHash } from 'node:crypto';
import { DatabaseError as PgDatabaseError, type ClientBase } from 'pg';
import { DatabaseError, type Sequelize, type Transaction } from 'sequelize';
import {
  serverOwnedFields,
  syncEntities,
  syncFieldSchemas,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';
import { execute, selectRows } from './sql';

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

/** One mutation of a batch written by `applyBatchAtOnce`: checked already, with the result it records. */
export interface BatchMutation {
  mutationId: string;
  entity: SyncEntity;
  id: string;
  /** 0 creates the row (with every device field); otherwise the version the change was made on. */
  baseVersion: number;
  fields: RowData;
  /** A time deletes the row; undefined leaves it as it is. */
  deletedAt: string | null | undefined;
  result: Raw;
}

// Parents before children, so a reader of the statement sees the order a device sends them in.
const entityOrder: readonly SyncEntity[] = ['clients', 'consents', 'recording_sessions', 'site_recordings'];

/** Fields the server fills when a device creates a row: who did it, and the state of the clip it names. */
const serverValuesOnCreate: Record<SyncEntity, Record<string, string>> = {
  clients: {},
  consents: { recorded_by: ':userId' },
  recording_sessions: { operator_id: ':userId' },
  site_recordings: {
    clip_state: `CASE WHEN r.clip_sha256 IS NULL THEN 'none' WHEN cb.state IN ('stored', 'failed') THEN cb.state ELSE 'pending' END`,
    analysis: `CASE WHEN cb.state = 'stored' THEN cb.analysis END`,
  },
};

// Codes under which the database refuses a batch as a whole: its last step found a mutation unwritten (22P02,
// see applyBatchAtOnce), a data or integrity rule (classes 22 and 23), or a deadlock or serialization failure.
const refusedWhole = (code: string | undefined) =>
  code !== undefined &&
  (code.startsWith('22') || code.startsWith('23') || code === '40001' || code === '40P01');

/** The pool under Sequelize: its connections are pg clients. */
interface PooledConnections {
  getConnection(options: { type: 'write' }): Promise<ClientBase>;
  releaseConnection(connection: ClientBase): void;
  destroyConnection(connection: ClientBase): Promise<void>;
}

// The batch statement's parameters, in order, with their types (a prepared statement fixes them once).
const batchParameters = [
  ['batch', 'jsonb'],
  ['clinicId', 'uuid'],
  ['userId', 'uuid'],
  ['deviceId', 'uuid'],
  ['count', 'bigint'],
] as const;

/** `:name` placeholders as typed `$n` parameters; `::type` casts are left alone. */
function positional(sql: string, parameters: readonly (readonly [string, string])[]): string {
  return sql.replace(/(?<![:\w]):([a-zA-Z]\w*)/g, (match, name: string) => {
    const at = parameters.findIndex(([known]) => known === name);
    if (at < 0) throw new Error(`no parameter :${name} in the batch statement`);
    return `CAST($${at + 1} AS ${parameters[at][1]})`;
  });
}

const preparedName = (sql: string) =>
  `sync_batch_${createHash('sha256').update(sql).digest('hex').slice(0, 24)}`;

/**
 * The connection's prepared statement does not fit the database any more: it was dropped under it (26000, e.g.
 * by a pooler's DISCARD ALL) or a column it reads changed type (0A000, "cached plan must not change result
 * type").
 */
const statementOutdated = (code: string) => code === '26000' || code === '0A000';

export const pgErrorOf = (error: unknown): { code?: string; constraint?: string; detail?: string } =>
  (error as { parent?: { code?: string; constraint?: string; detail?: string } })?.parent ?? {};

export class SyncRepository {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly transaction?: Transaction,
  ) {}

  private select<T extends object = Raw>(
    sql: string,
    replacements: Record<string, unknown> = {},
  ): Promise<T[]> {
    return selectRows<T>(this.sequelize, sql, replacements, this.transaction);
  }

  private run(sql: string, replacements: Record<string, unknown> = {}): Promise<number> {
    return execute(this.sequelize, sql, replacements, this.transaction);
  }

  /** Writers hold this (shared) until commit; see the migration for why. */
  async lockClinicForWrite(clinicId: string): Promise<void> {
    await this.select(`SELECT pg_advisory_xact_lock_shared(${SYNC_LOCK_CLASS}, hashtext(:clinicId))`, {
      clinicId,
    });
  }

  /**
   * Waits for this clinic's writers in flight, then reads the sequence: every change number up to the answer is
   * committed or rolled back, so a pull can safely move past it. Needs its own short transaction.
   */
  async safeHighWater(clinicId: string): Promise<string> {
    await this.select(`SELECT pg_advisory_xact_lock(${SYNC_LOCK_CLASS}, hashtext(:clinicId))`, { clinicId });
    // A sequence is read outside MVCC, and this second statement runs after the lock was granted.
    const [row] = await this.select<{ high: string }>(
      `SELECT (CASE WHEN is_called THEN last_value ELSE last_value - 1 END)::text AS high FROM sync_change_seq`,
    );
    return row.high;
  }

  /**
   * A whole batch in one statement, committed on its own: every create and edit with its version check and
   * parent check, the server's fields, and the record of each mutation. All or nothing: when any mutation would
   * write nothing (a replay, a stale version, a missing parent, a row of another clinic) or the database refuses
   * one, nothing is written and the answer is false; the caller then applies the batch one mutation at a time,
   * which tells each outcome apart. The caller guarantees each row appears once and no mutation deletes a parent
   * another one names, so deciding them all on one snapshot equals deciding them in order.
   */
  async applyBatchAtOnce(
    caller: { clinicId: string; userId: string; deviceId: string },
    mutations: BatchMutation[],
  ): Promise<boolean> {
    const batch = mutations.map((m) => ({
      mutation_id: m.mutationId,
      entity: m.entity,
      id: m.id,
      base_version: m.baseVersion,
      fields: Object.fromEntries(Object.entries(m.fields).map(([name, value]) => [snake(name), value])),
      has_deleted_at: m.deletedAt !== undefined,
      deleted_at: m.deletedAt ?? null,
      result: m.result,
    }));
    const steps: string[] = [];
    for (const entity of entityOrder) {
      const kinds = new Set(mutations.filter((m) => m.entity === entity).map((m) => m.baseVersion === 0));
      if (kinds.has(true)) steps.push(`create_${entity} AS (${createStep(entity)})`);
      if (kinds.has(false)) steps.push(`edit_${entity} AS (${editStep(entity)})`);
    }
    const written = steps.map((s) => `SELECT id FROM ${s.slice(0, s.indexOf(' '))}`).join(' UNION ALL ');
    // Plain SQL has no RAISE: when fewer mutations were recorded than sent, the last step casts a sentence to
    // an integer, which fails the statement and so undoes every write of it.
    const sql = positional(
      `WITH batch AS (
         SELECT * FROM jsonb_to_recordset(:batch) AS b(mutation_id uuid, entity text, id uuid,
           base_version integer, fields jsonb, has_deleted_at boolean, deleted_at timestamptz, result jsonb)),
       ${steps.join(',\n')},
       recorded AS (
         INSERT INTO applied_mutations (mutation_id, clinic_id, user_id, device_id, entity, row_id, result, applied_at)
         SELECT b.mutation_id, :clinicId, :userId, :deviceId, b.entity, b.id, b.result, now()
         FROM batch b JOIN (${written}) w ON w.id = b.id RETURNING 1)
       SELECT CASE WHEN count(*) = :count THEN count(*)
         ELSE ('batch not written whole, mutations written ' || count(*))::integer END AS written
       FROM recorded`,
      batchParameters,
    );
    try {
      await this.runPrepared(sql, [
        JSON.stringify(batch),
        caller.clinicId,
        caller.userId,
        caller.deviceId,
        batch.length,
      ]);
      return true;
    } catch (error) {
      // A statement kept on the connection that no longer fits (runPrepared has dropped that connection) goes the
      // slow way too; the next batch prepares the statement afresh.
      const { code } = pgErrorOf(error);
      if (refusedWhole(code) || (code !== undefined && statementOutdated(code))) return false;
      throw error;
    }
  }

  /**
   * Runs `sql` as a named prepared statement on a pooled connection, so PostgreSQL parses and plans it once per
   * connection instead of once per push (planning was most of the statement's time). Sequelize sends every
   * statement unnamed, so this takes the connection from Sequelize's pool and uses pg's own named statements.
   * The name is the text's hash: each shape of batch (which steps it has) is its own statement. Failures come
   * back as Sequelize's would, so callers and the error handler read them the same way.
   */
  private async runPrepared(sql: string, values: unknown[]): Promise<void> {
    if (this.transaction)
      throw new Error('a batch at once commits on its own: call it outside a transaction');
    const manager = this.sequelize.connectionManager as unknown as PooledConnections;
    const connection = await manager.getConnection({ type: 'write' });
    let keep = true;
    try {
      await connection.query({ name: preparedName(sql), text: sql, values });
    } catch (error) {
      // A lost link, or a statement the connection can no longer run: the connection is not used again.
      keep = error instanceof PgDatabaseError && !statementOutdated(error.code ?? '');
      throw new DatabaseError(error as Error & { sql: string; parameters: object });
    } finally {
      if (keep) manager.releaseConnection(connection);
      else await manager.destroyConnection(connection);
    }
  }

  async findAppliedMutation(mutationId: string): Promise<{ clinicId: string; result: Raw } | null> {
    const [row] = await this.select<{ clinic_id: string; result: Raw }>(
      `SELECT clinic_id, result FROM applied_mutations WHERE mutation_id = :mutationId`,
      { mutationId },
    );
    return row ? { clinicId: row.clinic_id, result: row.result } : null;
  }

  async recordMutation(args: MutationRecord): Promise<void> {
    await this.run(
      `INSERT INTO applied_mutations (mutation_id, clinic_id, user_id, device_id, entity, row_id, result, applied_at)
       VALUES (:mutationId, :clinicId, :userId, :deviceId, :entity, :rowId, :result::jsonb, now())`,
      { ...args, result: JSON.stringify(args.result) },
    );
  }

  /**
   * Runs `work` under a savepoint, so one mutation of a batch can fail alone inside the batch's transaction.
   * A database refusal rolls back to the savepoint and comes back as its code; anything else is thrown.
   */
  async isolated<T>(
    name: string,
    work: () => Promise<T>,
  ): Promise<{ value: T } | { refused: { code: string; constraint?: string; detail?: string } }> {
    await this.run(`SAVEPOINT ${name}`);
    try {
      const value = await work();
      await this.run(`RELEASE SAVEPOINT ${name}`);
      return { value };
    } catch (error) {
      const refusal = pgErrorOf(error);
      // Not the mutation's fault (deadlock, serialization) or not the database's: the batch starts again.
      if (!refusal.code || refusal.code === '40001' || refusal.code === '40P01') throw error;
      await this.run(`ROLLBACK TO SAVEPOINT ${name}`);
      return { refused: { ...refusal, code: refusal.code } };
    }
  }

  async lockRow(entity: SyncEntity, id: string): Promise<StoredRow | null> {
    const [raw] = await this.select(`SELECT * FROM ${entity} WHERE id = :id FOR UPDATE`, { id });
    return raw ? toStored(entity, raw) : null;
  }

  async findRow(entity: SyncEntity, clinicId: string, id: string): Promise<StoredRow | null> {
    const [raw] = await this.select(`SELECT * FROM ${entity} WHERE id = :id AND clinic_id = :clinicId`, {
      id,
      clinicId,
    });
    return raw ? toStored(entity, raw) : null;
  }

  async parentExists(table: string, clinicId: string, id: string): Promise<boolean> {
    const live = table === 'consent_texts' ? '' : 'AND deleted_at IS NULL';
    const rows = await this.select(
      `SELECT 1 FROM ${table} WHERE id = :id AND clinic_id = :clinicId ${live}`,
      {
        id,
        clinicId,
      },
    );
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
    const values: Record<string, unknown> = { id, clinicId, deletedAt };
    names.forEach((n, i) => (values[`f${i}`] = encode(fields[n])));
    await this.run(
      `INSERT INTO ${entity} (id, clinic_id, version, deleted_at${names.map((n) => `, ${snake(n)}`).join('')})
       VALUES (:id, :clinicId, 1, :deletedAt${names.map((_n, i) => `, :f${i}`).join('')})`,
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
    const values: Record<string, unknown> = { id, newVersion, deletedAt };
    const sets = ['version = :newVersion', 'updated_at = now()'];
    names.forEach((n, i) => {
      values[`f${i}`] = encode(fields[n]);
      sets.push(`${snake(n)} = :f${i}`);
    });
    if (deletedAt !== undefined) sets.push('deleted_at = :deletedAt');
    await this.run(`UPDATE ${entity} SET ${sets.join(', ')} WHERE id = :id`, values);
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
       VALUES (:id, :clinicId, :entity, :rowId, :mutationId, :deviceId, :userId, :serverVersion::jsonb, :clientVersion::jsonb, 'open', now(), now())`,
      {
        ...args,
        serverVersion: JSON.stringify(args.serverVersion),
        clientVersion: JSON.stringify(args.clientVersion),
      },
    );
  }

  async lastWriterOf(rowId: string): Promise<{ deviceId: string | null; userId: string | null } | null> {
    const [row] = await this.select<{ device_id: string | null; user_id: string | null }>(
      `SELECT device_id, user_id FROM applied_mutations WHERE row_id = :rowId AND result->>'status' = 'applied'
       ORDER BY applied_at DESC LIMIT 1`,
      { rowId },
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
          WHERE t.clinic_id = :clinicId AND t.change_seq > :after AND t.change_seq <= :upTo
          ORDER BY t.change_seq LIMIT :limit)`,
    );
    const rows = await this.select<{ entity: SyncEntity; raw: Raw }>(
      `${parts.join(' UNION ALL ')} ORDER BY change_seq LIMIT :limit`,
      { clinicId, after, upTo, limit },
    );
    return rows.map((r) => ({ entity: r.entity, ...toStored(r.entity, r.raw) }));
  }

  /** The kept size of a stored clip, or null when this clinic has no stored clip with this hash. */
  async storedClipSize(clinicId: string, sha256: string): Promise<number | null> {
    const [row] = await this.select<{ size_bytes: string }>(
      `SELECT size_bytes FROM clip_blobs WHERE sha256 = :sha256 AND clinic_id = :clinicId AND state = 'stored'`,
      { sha256, clinicId },
    );
    return row ? Number(row.size_bytes) : null;
  }

  async clipBlob(
    clinicId: string,
    sha256: string,
  ): Promise<{ state: string; failure: string | null; analysis: unknown } | null> {
    const [row] = await this.select<{ state: string; failure: string | null; analysis: unknown }>(
      `SELECT state, failure, analysis FROM clip_blobs WHERE sha256 = :sha256 AND clinic_id = :clinicId`,
      { sha256, clinicId },
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
       VALUES (:sha256, :clinicId, :sizeBytes, 'application/x-fourpoint-sealed', :storageKey, :state, :analysis::jsonb, :failure, now(), now())
       ON CONFLICT (sha256) DO UPDATE SET state = EXCLUDED.state, analysis = EXCLUDED.analysis, failure = EXCLUDED.failure,
         storage_key = EXCLUDED.storage_key, updated_at = now()
       WHERE clip_blobs.clinic_id = EXCLUDED.clinic_id`,
      { ...args, analysis: JSON.stringify(args.analysis ?? null) },
    );
  }

  /** Server-derived fields: the change number moves (devices pull it) but the version does not. */
  attachClipToRecordings(
    clinicId: string,
    sha256: string,
    clipState: 'stored' | 'failed',
    analysis: unknown,
  ): Promise<number> {
    return this.run(
      `UPDATE site_recordings SET clip_state = :clipState, analysis = :analysis::jsonb
       WHERE clinic_id = :clinicId AND clip_sha256 = :sha256`,
      { clinicId, sha256, clipState, analysis: JSON.stringify(analysis ?? null) },
    );
  }

  async setServerFields(entity: SyncEntity, id: string, fields: RowData): Promise<void> {
    const names = Object.keys(fields);
    if (names.length === 0) return;
    const values: Record<string, unknown> = { id };
    names.forEach((n, i) => (values[`f${i}`] = encode(fields[n])));
    await this.run(
      `UPDATE ${entity} SET ${names.map((n, i) => `${snake(n)} = :f${i}`).join(', ')} WHERE id = :id`,
      values,
    );
  }
}

/**
 * A parent named by field `column` of the row being written (`value` is the SQL for its id) must be a live row
 * of the clinic, or be created earlier in the same batch (the caller has checked the order) and not as deleted.
 */
function parentCheck(table: string, value: string): string {
  const live = table === 'consent_texts' ? '' : 'AND p.deleted_at IS NULL';
  return `(EXISTS (SELECT 1 FROM ${table} p WHERE p.id = ${value} AND p.clinic_id = :clinicId ${live})
    OR EXISTS (SELECT 1 FROM batch n WHERE n.entity = '${table}' AND n.base_version = 0 AND n.id = ${value}
      AND n.deleted_at IS NULL))`;
}

/** Inserts the batch's new rows of `entity`; a taken id writes nothing (ON CONFLICT), which the count catches. */
function createStep(entity: SyncEntity): string {
  const device = deviceFields[entity].map(snake);
  const server = serverValuesOnCreate[entity];
  const checks = Object.entries(parentsOf[entity]).map(([field, table]) =>
    parentCheck(table, `r.${snake(field)}`),
  );
  const clip =
    entity === 'site_recordings'
      ? 'LEFT JOIN clip_blobs cb ON cb.sha256 = r.clip_sha256 AND cb.clinic_id = :clinicId'
      : '';
  return `INSERT INTO ${entity} (id, clinic_id, version, deleted_at, ${[...device, ...Object.keys(server)].join(', ')})
    SELECT b.id, :clinicId, 1, b.deleted_at, ${[...device.map((c) => `r.${c}`), ...Object.values(server)].join(', ')}
    FROM batch b CROSS JOIN LATERAL jsonb_populate_record(NULL::${entity}, b.fields) r ${clip}
    WHERE b.entity = '${entity}' AND b.base_version = 0 ${checks.map((c) => `AND ${c}`).join(' ')}
    ON CONFLICT (id) DO NOTHING RETURNING id`;
}

/** Applies the batch's edits of `entity` to rows of the clinic still at the version each edit was made on. */
function editStep(entity: SyncEntity): string {
  const device = deviceFields[entity].map(snake);
  const checks = Object.entries(parentsOf[entity]).map(([field, table]) => {
    const column = snake(field);
    return `(b.fields->>'${column}' IS NULL OR ${parentCheck(table, `(b.fields->>'${column}')::uuid`)})`;
  });
  // The row itself (t) is the base of the new values, so fields the edit leaves out keep their values.
  return `UPDATE ${entity} t
    SET (${device.join(', ')}) = (SELECT ${device.map((c) => `r.${c}`).join(', ')} FROM jsonb_populate_record(t, b.fields) r),
      version = t.version + 1, updated_at = now(),
      deleted_at = CASE WHEN b.has_deleted_at THEN b.deleted_at ELSE t.deleted_at END
    FROM batch b
    WHERE b.entity = '${entity}' AND b.base_version > 0 AND t.id = b.id AND t.clinic_id = :clinicId
      AND t.version = b.base_version ${checks.map((c) => `AND ${c}`).join(' ')}
    RETURNING t.id`;
}

function encode(value: unknown): unknown {
  return value !== null && typeof value === 'object' ? JSON.stringify(value) : value;
}

export { camel, snake };
