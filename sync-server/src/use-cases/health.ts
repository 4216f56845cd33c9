import type { Sequelize } from 'sequelize';
import type { ReadinessProbe } from '../services/readiness-probe';
import type { HealthResponse, ReadinessResponse } from '@/shared/protocol';
import { isStopping } from '../lifecycle';
import { databaseAnswers } from '../repositories/health-repository';

export async function checkHealth(sequelize: Sequelize): Promise<HealthResponse> {
  return (await databaseAnswers(sequelize)) ? { ok: true, db: 'up' } : { ok: false, db: 'down' };
}

/**
 * Ready to serve: the database and the blob store answered the background probe (readiness-probe.ts; never a
 * query of its own, so a busy request pool does not make a working instance look down), and the process is not
 * stopping.
 */
export async function checkReadiness(readiness: ReadinessProbe): Promise<ReadinessResponse> {
  const { db, storage } = await readiness.current();
  const stopping = isStopping();
  return {
    ok: db && storage && !stopping,
    db: db ? 'up' : 'down',
    storage: storage ? 'up' : 'down',
    stopping,
  };
}
