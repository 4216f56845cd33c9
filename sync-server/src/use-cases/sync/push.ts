import { randomUUID } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { fieldWriteRefusal, valueWriteRefusal } from '@/shared/protocol/field-access';
import {
  isDeviceField,
  serverOwnedFields,
  syncFieldSchemas,
  type Mutation,
  type MutationResult,
  type PushRequest,
  type PushResponse,
  type RejectionCode,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';
import {
  SyncRepository,
  parentsOf,
  pgErrorOf,
  type BatchMutation,
  type StoredRow,
} from '../../repositories/sync-repository';
import type { Caller } from '../context';

class Rejection extends Error {
  constructor(
    readonly code: RejectionCode,
    message: string,
  ) {
    super(message);
  }
}

const rejected = (m: Mutation, code: RejectionCode, reason: string): MutationResult => ({
  mutationId: m.mutationId,
  status: 'rejected',
  code,
  reason,
});

// Built once: deriving a schema compiles it anew, which cost more than the rest of a push's checks.
const partialSchemas = Object.fromEntries(
  Object.entries(syncFieldSchemas).map(([entity, schema]) => [entity, schema.partial()]),
) as { [E in SyncEntity]: ReturnType<(typeof syncFieldSchemas)[E]['partial']> };

/**
 * The fields this change writes that the role must be allowed to write. A new row carries every field, so a
 * field the role does not own is accepted there as null: the empty value, which writes nothing.
 */
function writtenFields(m: Mutation, fields: RowData, deletedAt: unknown): string[] {
  const written = Object.keys(fields).filter((name) => m.baseVersion !== 0 || fields[name] !== null);
  return deletedAt === undefined ? written : [...written, 'deletedAt'];
}

/** Splits a change into field values and the tombstone, refusing anything the caller's device may not write. */
export function checkChange(m: Mutation, role: Role): { fields: RowData; deletedAt: string | undefined } {
  const { deletedAt, ...fields } = m.change;
  const serverOwned = serverOwnedFields[m.entity] as readonly string[];
  for (const name of Object.keys(fields)) {
    if (serverOwned.includes(name))
      throw new Rejection('invalid_change', `${name} is set by the server, not by a device.`);
    if (!isDeviceField(m.entity, name))
      throw new Rejection('invalid_change', `${m.entity} has no field ${name}.`);
  }
  if (deletedAt !== undefined && (typeof deletedAt !== 'string' || Number.isNaN(Date.parse(deletedAt)))) {
    throw new Rejection(
      'invalid_change',
      'deletedAt must be a time: a deleted row cannot be brought back by a device.',
    );
  }
  const refusal = fieldWriteRefusal(role, m.entity, writtenFields(m, fields, deletedAt));
  if (refusal) throw new Rejection('forbidden', refusal);
  const parsed = partialSchemas[m.entity].safeParse(fields);
  if (!parsed.success) {
    const detail = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Rejection('invalid_change', `The change is not valid: ${detail}`);
  }
  const valueRefusal = valueWriteRefusal(role, m.entity, parsed.data);
  if (valueRefusal) throw new Rejection('forbidden', valueRefusal);
  return { fields: parsed.data as RowData, deletedAt };
}

function replayOf(mutationId: string, recorded: Record<string, unknown>): MutationResult {
  if (recorded.status === 'conflict') {
    return {
      mutationId,
      status: 'already_applied',
      original: 'conflict',
      conflictId: String(recorded.conflictId),
    };
  }
  return {
    mutationId,
    status: 'already_applied',
    original: 'applied',
    newVersion: Number(recorded.newVersion),
  };
}

const serverError = (m: Mutation) =>
  rejected(m, 'server_error', 'The server could not apply this change just now; it will be sent again.');

/** What a database refusal of one mutation means to the device. */
function refusalOf(m: Mutation, code: string, constraint?: string): MutationResult {
  if (code === '23505' && constraint === 'site_recordings_one_per_site') {
    return rejected(
      m,
      'invalid_change',
      'This session already has a recording for that site; change the existing one instead.',
    );
  }
  if (code === '23505')
    return rejected(
      m,
      'invalid_change',
      'The clinic already holds a record under this one’s identity, so this change was not applied. Ask the clinic’s admin if something is missing.',
    );
  if (code === '23503')
    return rejected(
      m,
      'missing_parent',
      'This change belongs to a client or visit the clinic does not have (not sent yet, or erased).',
    );
  if (code === '23514' || code === '22P02' || code === '22007' || code === '22008') {
    return rejected(
      m,
      'invalid_change',
      'The clinic could not store this change: one of its values is not allowed.',
    );
  }
  return serverError(m);
}

type Change = ReturnType<typeof checkChange>;
export type Checked = { m: Mutation; change: Change } | { m: Mutation; rejection: MutationResult };

export function checkMutation(m: Mutation, role: Role): Checked {
  try {
    return { m, change: checkChange(m, role) };
  } catch (error) {
    if (error instanceof Rejection) return { m, rejection: rejected(m, error.code, error.message) };
    throw error;
  }
}

/**
 * Applies a batch. The usual batch (new rows and edits on the versions the server has) goes in one statement
 * that writes all of it or nothing; any other batch, or one that statement declines, is applied one mutation at
 * a time, which finds out each mutation's outcome. Either way each applied mutation's id is recorded with its
 * change, so a replay answers "already applied".
 */
export async function pushChanges(
  sequelize: Sequelize,
  caller: Caller,
  request: PushRequest,
): Promise<PushResponse> {
  const checked = request.mutations.map((m) => checkMutation(m, caller.role));
  const batch = batchForOneStatement(checked);
  if (batch) {
    try {
      const repo = new SyncRepository(sequelize);
      if (await repo.applyBatchAtOnce({ ...caller, deviceId: request.deviceId }, batch))
        return { results: batch.map((b) => b.result as unknown as MutationResult) };
    } catch (error) {
      // A database that cannot be reached now: the device sends the batch again.
      if (!pgErrorOf(error).code) return { results: checked.map((c) => serverError(c.m)) };
      throw error;
    }
  }
  return applyOneByOne(sequelize, caller, request.deviceId, checked);
}

/**
 * The batch as one statement's input, or null when deciding it on one snapshot could differ from deciding it in
 * order: a mutation refused by the checks, a row changed twice, a new row missing fields (its refusal names
 * them), a clip named by an edit (its state is looked up on the slow path), a parent created after its child or
 * deleted by the same batch.
 */
export function batchForOneStatement(checked: Checked[]): BatchMutation[] | null {
  const position = new Map<string, number>();
  for (const [index, c] of checked.entries()) {
    if ('rejection' in c || position.has(c.m.id)) return null;
    position.set(c.m.id, index);
  }
  const batch: BatchMutation[] = [];
  for (const [index, c] of checked.entries()) {
    if ('rejection' in c) return null;
    const { m, change } = c;
    if (m.baseVersion === 0 && !syncFieldSchemas[m.entity].safeParse(change.fields).success) return null;
    if (m.baseVersion !== 0 && m.entity === 'site_recordings' && 'clipSha256' in change.fields) return null;
    for (const field of Object.keys(parentsOf[m.entity])) {
      const parentId = change.fields[field];
      const at = typeof parentId === 'string' ? position.get(parentId) : undefined;
      if (at === undefined) continue;
      const parent = checked[at] as { m: Mutation; change: Change };
      if (parent.change.deletedAt !== undefined) return null;
      if (parent.m.baseVersion === 0 && at > index) return null;
    }
    const newVersion = m.baseVersion + 1;
    batch.push({
      mutationId: m.mutationId,
      entity: m.entity,
      id: m.id,
      baseVersion: m.baseVersion,
      fields: change.fields,
      deletedAt: m.baseVersion === 0 ? (change.deletedAt ?? null) : change.deletedAt,
      result: { mutationId: m.mutationId, status: 'applied', newVersion },
    });
  }
  return batch;
}

const RETRYABLE = new Set(['40001', '40P01']);

/**
 * One transaction, in order. The quick pass runs every mutation straight; if the database refuses one, the whole
 * pass is undone and a careful pass runs each mutation under its own savepoint, so one bad mutation fails alone
 * and the others still apply.
 */
async function applyOneByOne(
  sequelize: Sequelize,
  caller: Caller,
  deviceId: string,
  checked: Checked[],
): Promise<PushResponse> {
  let careful = false;
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(async (transaction) => {
        const repo = new SyncRepository(sequelize, transaction);
        const results: MutationResult[] = [];
        for (const [index, c] of checked.entries()) {
          if ('rejection' in c) results.push(c.rejection);
          else if (careful) results.push(await applyIsolated(repo, caller, deviceId, c.m, c.change, index));
          else results.push(await applyOrReject(repo, caller, deviceId, c.m, c.change));
        }
        return { results };
      });
    } catch (error) {
      const { code } = pgErrorOf(error);
      if (code && attempt < 4) {
        if (!RETRYABLE.has(code)) careful = true;
        continue;
      }
      return { results: checked.map((c) => ('rejection' in c ? c.rejection : serverError(c.m))) };
    }
  }
}

async function applyOrReject(
  repo: SyncRepository,
  caller: Caller,
  deviceId: string,
  m: Mutation,
  change: Change,
): Promise<MutationResult> {
  try {
    const result = await applyMutation(repo, caller, m, change, deviceId);
    if (result.status !== 'already_applied') await repo.recordMutation(record(caller, deviceId, m, result));
    return result;
  } catch (error) {
    // Rejections are decided before anything of this mutation is written, so the transaction stays usable.
    if (error instanceof Rejection) return rejected(m, error.code, error.message);
    throw error;
  }
}

async function applyIsolated(
  repo: SyncRepository,
  caller: Caller,
  deviceId: string,
  m: Mutation,
  change: Change,
  index: number,
): Promise<MutationResult> {
  const outcome = await repo.isolated(`mutation_${index}`, () =>
    applyOrReject(repo, caller, deviceId, m, change),
  );
  if ('value' in outcome) return outcome.value;
  const { code, constraint } = outcome.refused;
  // The mutation id is recorded already (a delivery that committed meanwhile, or another clinic's id).
  if (code === '23505' && constraint === 'applied_mutations_pkey') {
    const recorded = await repo.findAppliedMutation(m.mutationId);
    if (recorded?.clinicId === caller.clinicId) return replayOf(m.mutationId, recorded.result);
    if (recorded)
      return rejected(
        m,
        'forbidden',
        'This change was already used by another clinic, so it was not applied here.',
      );
  }
  return refusalOf(m, code, constraint);
}

const record = (caller: Caller, deviceId: string, m: Mutation, result: MutationResult) => ({
  mutationId: m.mutationId,
  clinicId: caller.clinicId,
  userId: caller.userId,
  deviceId,
  entity: m.entity,
  rowId: m.id,
  result: result as unknown as Record<string, unknown>,
});

/** One mutation, decided on its row as it is now (locked): a replay, a create, a stale edit or an edit. */
async function applyMutation(
  repo: SyncRepository,
  caller: Caller,
  m: Mutation,
  change: Change,
  deviceId: string,
): Promise<MutationResult> {
  const row = await repo.lockRow(m.entity, m.id);
  // Read after the row lock: a delivery of the same mutation that held it has committed by now.
  const recorded = await repo.findAppliedMutation(m.mutationId);
  if (recorded) {
    if (recorded.clinicId !== caller.clinicId)
      throw new Rejection(
        'forbidden',
        'This change was already used by another clinic, so it was not applied here.',
      );
    return replayOf(m.mutationId, recorded.result);
  }
  if (row && row.clinicId !== caller.clinicId)
    throw new Rejection('forbidden', 'This row belongs to another clinic.');
  if (!row) return createRow(repo, caller, m, change);
  if (row.version !== m.baseVersion) return recordConflict(repo, caller, m, change, row, deviceId);
  return editRow(repo, caller, m, change, row);
}

async function createRow(
  repo: SyncRepository,
  caller: Caller,
  m: Mutation,
  { fields, deletedAt }: Change,
): Promise<MutationResult> {
  if (m.baseVersion !== 0) {
    throw new Rejection(
      'unknown_row',
      `There is no ${m.entity} row ${m.id} on the server to change (version ${m.baseVersion}).`,
    );
  }
  const full = syncFieldSchemas[m.entity].safeParse(fields);
  if (!full.success) {
    const missing = full.error.issues.map((i) => i.path.join('.')).join(', ');
    throw new Rejection(
      'invalid_change',
      `A new ${m.entity} row needs every field; missing or invalid: ${missing}.`,
    );
  }
  await checkParents(repo, caller.clinicId, m, fields);
  const serverFields = await serverFieldsOnCreate(repo, caller, m, fields);
  await repo.insertRow(m.entity, caller.clinicId, m.id, { ...fields, ...serverFields }, deletedAt ?? null);
  return { mutationId: m.mutationId, status: 'applied', newVersion: 1 };
}

/** A stale edit never overwrites: both versions are kept, field by field, for an admin to settle. */
async function recordConflict(
  repo: SyncRepository,
  caller: Caller,
  m: Mutation,
  { fields, deletedAt }: Change,
  row: StoredRow,
  deviceId: string,
): Promise<MutationResult> {
  const conflictId = randomUUID();
  await repo.insertConflict({
    id: conflictId,
    clinicId: caller.clinicId,
    entity: m.entity,
    rowId: m.id,
    mutationId: m.mutationId,
    deviceId,
    userId: caller.userId,
    serverVersion: { ...snapshot(row), lastWriter: await repo.lastWriterOf(m.id) },
    clientVersion: {
      version: m.baseVersion,
      deletedAt: deletedAt ?? row.deletedAt,
      data: { ...row.data, ...fields },
      change: m.change,
    },
  });
  return { mutationId: m.mutationId, status: 'conflict', conflictId, serverVersion: row.version };
}

async function editRow(
  repo: SyncRepository,
  caller: Caller,
  m: Mutation,
  { fields, deletedAt }: Change,
  row: StoredRow,
): Promise<MutationResult> {
  await checkParents(repo, caller.clinicId, m, fields);
  const newVersion = row.version + 1;
  await repo.updateRow(m.entity, m.id, fields, deletedAt, newVersion);
  if (m.entity === 'site_recordings' && 'clipSha256' in fields && fields.clipSha256 !== row.data.clipSha256) {
    const clip = await clipFields(repo, caller.clinicId, fields.clipSha256 as string | null);
    await repo.setServerFields(m.entity, m.id, clip);
  }
  return { mutationId: m.mutationId, status: 'applied', newVersion };
}

function snapshot(row: StoredRow): Record<string, unknown> {
  return { version: row.version, deletedAt: row.deletedAt, data: row.data, updatedAt: row.updatedAt };
}

async function checkParents(
  repo: SyncRepository,
  clinicId: string,
  m: Mutation,
  fields: RowData,
): Promise<void> {
  for (const [field, table] of Object.entries(parentsOf[m.entity])) {
    const id = fields[field];
    if (typeof id !== 'string') continue;
    if (!(await repo.parentExists(table, clinicId, id))) {
      throw new Rejection(
        'missing_parent',
        `The ${field.replace(/Id$/, '')} this ${m.entity} row belongs to (${id}) is not on the server.`,
      );
    }
  }
}

async function clipFields(repo: SyncRepository, clinicId: string, sha256: string | null): Promise<RowData> {
  if (!sha256) return { clipState: 'none', analysis: null };
  const blob = await repo.clipBlob(clinicId, sha256);
  if (blob?.state === 'stored') return { clipState: 'stored', analysis: blob.analysis };
  if (blob?.state === 'failed') return { clipState: 'failed', analysis: null };
  return { clipState: 'pending', analysis: null };
}

async function serverFieldsOnCreate(
  repo: SyncRepository,
  caller: Caller,
  m: Mutation,
  fields: RowData,
): Promise<RowData> {
  if (m.entity === 'recording_sessions') return { operatorId: caller.userId };
  if (m.entity === 'consents') return { recordedBy: caller.userId };
  if (m.entity === 'site_recordings')
    return clipFields(repo, caller.clinicId, (fields.clipSha256 as string | null) ?? null);
  return {};
}
