import type { Sequelize } from 'sequelize';
import {
  syncEntitySchema,
  type ConflictDetail,
  type ConflictSummary,
  type ResolveConflictRequest,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';
import { fieldWriteRefusal, valueWriteRefusal } from '@/shared/protocol/field-access';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import { SyncConflictsRepository, type ConflictRecord } from '../../repositories/sync-conflicts-repository';
import { SyncRepository, type StoredRow } from '../../repositories/sync-repository';
import type { Caller } from '../context';

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/** What the device wanted: its change on top of the row as it is on the server now. */
function sides(record: ConflictRecord, current: StoredRow | null) {
  const snapshot = record.serverVersion as { version: number; deletedAt: string | null; data: RowData };
  const server = current
    ? { version: current.version, deletedAt: current.deletedAt, data: current.data }
    : snapshot;
  const change = ((record.clientVersion as { change?: RowData }).change ?? {}) as RowData;
  const { deletedAt: changeDeletedAt, ...changeFields } = change;
  const client = {
    version: Number((record.clientVersion as { version?: number }).version ?? 0),
    deletedAt: typeof changeDeletedAt === 'string' ? changeDeletedAt : server.deletedAt,
    data: { ...server.data, ...changeFields },
  };
  const differing = Object.keys(changeFields).filter((f) => !same(server.data[f], changeFields[f]));
  if (typeof changeDeletedAt === 'string' && !server.deletedAt) differing.push('deletedAt');
  return { server, client, change, differing };
}

function labelOf(entity: string, data: RowData): string {
  switch (entity) {
    case 'clients':
      return `Client ${String(data.firstName ?? '')} ${String(data.lastName ?? '')}`.trim();
    case 'consents':
      return `Consent signed by ${String(data.typedName ?? 'unknown')}`;
    case 'recording_sessions':
      return `Session started ${String(data.startedAt ?? '')
        .slice(0, 16)
        .replace('T', ' ')}`;
    case 'site_recordings':
      return `${String(data.site ?? 'Site')} recording`.replace(/^./, (c) => c.toUpperCase());
    default:
      return entity;
  }
}

async function describe(
  sequelize: Sequelize,
  record: ConflictRecord,
  current: StoredRow | null,
): Promise<ConflictDetail> {
  const { server, client, change, differing } = sides(record, current);
  const lastWriter = (
    record.serverVersion as { lastWriter?: { deviceId: string | null; userId: string | null } | null }
  ).lastWriter;
  const repo = new SyncConflictsRepository(sequelize);
  const resolution = record.resolution as {
    note?: string;
    newVersion?: number;
    picks?: Record<string, 'server' | 'client'>;
  } | null;
  return {
    id: record.id,
    entity: syncEntitySchema.parse(record.entity),
    rowId: record.rowId,
    status: record.status,
    createdAt: record.createdAt,
    deviceId: record.deviceId,
    userName: record.userName,
    serverDeviceId: lastWriter?.deviceId ?? null,
    serverUserName: await repo.userName(lastWriter?.userId ?? null),
    differingFields: differing,
    label: labelOf(record.entity, server.data),
    server,
    client,
    clientChange: change,
    current: current ? { version: current.version, deletedAt: current.deletedAt, data: current.data } : null,
    resolution:
      record.status === 'resolved' && resolution
        ? {
            note: String(resolution.note ?? ''),
            resolvedBy: record.resolvedByName,
            resolvedAt: record.resolvedAt ?? '',
            newVersion: Number(resolution.newVersion ?? 0),
            kept: resolution.picks ?? {},
          }
        : null,
  };
}

export async function listConflicts(
  sequelize: Sequelize,
  caller: Caller,
  status: 'open' | 'resolved' | 'all',
): Promise<ConflictSummary[]> {
  const records = await new SyncConflictsRepository(sequelize).list(caller.clinicId, status);
  const rows = new SyncRepository(sequelize);
  const out: ConflictSummary[] = [];
  for (const record of records) {
    const current = await rows.findRow(record.entity as SyncEntity, caller.clinicId, record.rowId);
    const {
      server: _s,
      client: _c,
      clientChange: _cc,
      current: _cur,
      resolution: _r,
      ...summary
    } = await describe(sequelize, record, current);
    out.push(summary);
  }
  return out;
}

export async function getConflict(sequelize: Sequelize, caller: Caller, id: string): Promise<ConflictDetail> {
  const record = await new SyncConflictsRepository(sequelize).find(caller.clinicId, id);
  if (!record) throw new AppError('not_found', 'There is no such conflict in this clinic.', 404);
  const current = await new SyncRepository(sequelize).findRow(
    record.entity as SyncEntity,
    caller.clinicId,
    record.rowId,
  );
  return describe(sequelize, record, current);
}

/**
 * The admin's choice becomes a new version of the row (even "keep the server's" does, so every device that held
 * the losing change pulls a row and settles on it); the conflict is closed and the audit log records who and why.
 */
export async function resolveConflict(
  sequelize: Sequelize,
  caller: Caller,
  id: string,
  request: ResolveConflictRequest,
): Promise<{ conflict: ConflictDetail; newVersion: number }> {
  const newVersion = await sequelize.transaction(async (transaction) => {
    const rows = new SyncRepository(sequelize, transaction);
    const conflicts = new SyncConflictsRepository(sequelize, transaction);
    await rows.lockClinicForWrite(caller.clinicId);
    const record = await conflicts.find(caller.clinicId, id, true);
    if (!record) throw new AppError('not_found', 'There is no such conflict in this clinic.', 404);
    if (record.status !== 'open')
      throw new AppError('already_resolved', 'This conflict was already resolved.', 409);
    const entity = record.entity as SyncEntity;
    const current = await rows.lockRow(entity, record.rowId);
    if (!current)
      throw new AppError(
        'row_gone',
        'The record in this conflict is no longer at the clinic (it may have been erased).',
        409,
      );
    const { client, differing } = sides(record, current);

    let picks: Record<string, 'server' | 'client'>;
    if (request.keep === 'fields') {
      picks = request.fields ?? {};
      const missing = differing.filter((f) => !Object.hasOwn(picks, f));
      const unknown = Object.keys(picks).filter((f) => !differing.includes(f));
      if (missing.length || unknown.length) {
        throw new AppError(
          'validation_failed',
          `Pick a side for exactly the differing fields (${differing.join(', ') || 'none'}).` +
            (missing.length ? ` Missing: ${missing.join(', ')}.` : '') +
            (unknown.length ? ` Not differing: ${unknown.join(', ')}.` : ''),
          400,
        );
      }
    } else {
      picks = Object.fromEntries(differing.map((f) => [f, request.keep as 'server' | 'client']));
    }
    const fields: RowData = {};
    let deletedAt: string | undefined;
    for (const [field, side] of Object.entries(picks)) {
      if (side !== 'client') continue;
      if (field === 'deletedAt') deletedAt = client.deletedAt ?? undefined;
      else fields[field] = client.data[field];
    }
    // The kept fields are the device user's writing, not the admin's: they must be theirs to write.
    const author = await conflicts.userRole(record.userId);
    const fromDevice = [...Object.keys(fields), ...(deletedAt === undefined ? [] : ['deletedAt'])];
    const refusal = author
      ? (fieldWriteRefusal(author, entity, fromDevice) ?? valueWriteRefusal(author, entity, fields))
      : fromDevice.length
        ? 'The person who made this change is no longer on the team, so only the server side can be kept.'
        : null;
    if (refusal) {
      throw new AppError('field_not_writable', `${refusal} Keep the server's side for those fields.`, 403, {
        fields: fromDevice,
      });
    }
    const version = current.version + 1;
    await rows.updateRow(entity, record.rowId, fields, deletedAt, version);
    await conflicts.markResolved(record.id, caller.userId, {
      keep: request.keep,
      picks,
      note: request.note,
      newVersion: version,
    });
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'sync.conflict.resolved',
        entity,
        entityId: record.rowId,
        ip: caller.ip,
        details: {
          conflictId: record.id,
          keep: request.keep,
          picks,
          note: request.note,
          newVersion: version,
        },
      },
      transaction,
    );
    return version;
  });
  return { conflict: await getConflict(sequelize, caller, id), newVersion };
}
