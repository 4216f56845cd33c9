import type { Sequelize } from 'sequelize';
import type { PullResponse } from '@/shared/protocol/sync';
import { SyncRepository } from '../../repositories/sync-repository';
import type { Caller } from '../context';

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
      data: r.data,
    })),
    nextCheckpoint: hasMore ? page[page.length - 1].changeSeq : high,
    hasMore,
  };
}
