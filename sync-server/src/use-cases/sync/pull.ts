import type { Sequelize } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { readableFields } from '@/shared/protocol/field-access';
import { syncEntities, type RowData, type PullResponse, type SyncEntity } from '@/shared/protocol/sync';
import { SyncRepository } from '../../repositories/sync-repository';
import type { Caller } from '../context';

const readable = (role: Role) =>
  Object.fromEntries(syncEntities.map((e) => [e, readableFields(role, e)])) as Record<SyncEntity, string[]>;
const readableByRole: Record<Role, Record<SyncEntity, string[]>> = {
  operator: readable('operator'),
  practitioner: readable('practitioner'),
  admin: readable('admin'),
};

/** Only the fields the role may read (shared/protocol/field-access.ts); the others are not sent at all. */
function visibleData(role: Role, entity: SyncEntity, data: RowData): RowData {
  const visible: RowData = {};
  for (const field of readableByRole[role][entity]) if (field in data) visible[field] = data[field];
  return visible;
}

/** A page of the clinic's changes after the checkpoint, in change order, never past a number still in flight. */
export async function pullChanges(
  sequelize: Sequelize,
  caller: Caller,
  checkpoint: string,
  limit: number,
): Promise<PullResponse> {
  const high = await sequelize.transaction((transaction) =>
    new SyncRepository(sequelize, transaction).safeHighWater(caller.clinicId),
  );
  if (BigInt(high) <= BigInt(checkpoint)) return { rows: [], nextCheckpoint: checkpoint, hasMore: false };
  const rows = await new SyncRepository(sequelize).changesBetween(
    caller.clinicId,
    checkpoint,
    high,
    limit + 1,
  );
  const hasMore = rows.length > limit;
  const page = hasMore ? rows.slice(0, limit) : rows;
  return {
    rows: page.map((r) => ({
      entity: r.entity,
      id: r.id,
      version: r.version,
      changeSeq: r.changeSeq,
      updatedAt: r.updatedAt,
      deletedAt: r.deletedAt,
      data: visibleData(caller.role, r.entity, r.data),
    })),
    nextCheckpoint: hasMore ? page[page.length - 1].changeSeq : high,
    hasMore,
  };
}
