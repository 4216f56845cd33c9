import type { Sequelize } from 'sequelize';
import type { HealthResponse } from '@/shared/protocol';
import { databaseAnswers } from '../repositories/health-repository';

export async function checkHealth(sequelize: Sequelize): Promise<HealthResponse> {
  return (await databaseAnswers(sequelize)) ? { ok: true, db: 'up' } : { ok: false, db: 'down' };
}
