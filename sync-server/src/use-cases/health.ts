import type { Sequelize } from 'sequelize';
import type { HealthResponse, ReadinessResponse } from '@/shared/protocol';
import { isStopping } from '../lifecycle';
import { databaseAnswers } from '../repositories/health-repository';
import { blobKeyFor } from '../services/blob-store';
import { syncServicesFor } from '../composition-root';

export async function checkHealth(sequelize: Sequelize): Promise<HealthResponse> {
  return (await databaseAnswers(sequelize)) ? { ok: true, db: 'up' } : { ok: false, db: 'down' };
}

// A key no clip can have (the sha256 of nothing is never a sealed clip): asking for it reaches the store and
// answers "not there" when the store is up, and throws when it is not.
const PROBE_KEY = blobKeyFor('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');

async function storageAnswers(sequelize: Sequelize): Promise<boolean> {
  try {
    await syncServicesFor(sequelize).blobStore.has(PROBE_KEY);
    return true;
  } catch {
    return false;
  }
}

/** Ready to serve: the database and the blob store answer, and the process is not stopping. */
export async function checkReadiness(sequelize: Sequelize): Promise<ReadinessResponse> {
  const [db, storage] = await Promise.all([databaseAnswers(sequelize), storageAnswers(sequelize)]);
  const stopping = isStopping();
  return {
    ok: db && storage && !stopping,
    db: db ? 'up' : 'down',
    storage: storage ? 'up' : 'down',
    stopping,
  };
}
