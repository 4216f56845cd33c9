import type { Sequelize, Transaction } from 'sequelize';
import { storedTraceSchema, type StoredTrace } from '@/shared/protocol/analysis';
import { execute, selectRows } from './sql';

export type ClipBlobRecord = {
  storageKey: string | null;
  contentType: string;
  state: string;
  /** The display trace kept when the clip was processed; null for a clip processed before traces were kept. */
  trace: StoredTrace | null;
};

export async function findClipBlob(
  sequelize: Sequelize,
  clinicId: string,
  sha256: string,
): Promise<ClipBlobRecord | null> {
  const [row] = await selectRows<{
    storage_key: string | null;
    content_type: string;
    state: string;
    trace: unknown;
  }>(
    sequelize,
    `SELECT storage_key, content_type, state, trace FROM clip_blobs WHERE clinic_id = :clinicId AND sha256 = :sha256`,
    { clinicId, sha256 },
  );
  if (!row) return null;
  // A trace that does not read as one is drawn again from the clip, as if there were none.
  const trace = storedTraceSchema.safeParse(row.trace);
  return {
    storageKey: row.storage_key,
    contentType: row.content_type,
    state: row.state,
    trace: trace.success ? trace.data : null,
  };
}

export async function saveClipTrace(
  sequelize: Sequelize,
  clinicId: string,
  sha256: string,
  trace: StoredTrace,
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `UPDATE clip_blobs SET trace = CAST(:trace AS jsonb) WHERE clinic_id = :clinicId AND sha256 = :sha256`,
    { clinicId, sha256, trace: JSON.stringify(trace) },
    transaction,
  );
}
