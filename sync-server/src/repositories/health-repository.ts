import type { Sequelize } from 'sequelize';
import { selectRows } from './sql';

export async function databaseAnswers(sequelize: Sequelize): Promise<boolean> {
  try {
    await selectRows(sequelize, 'SELECT 1');
    return true;
  } catch {
    return false;
  }
}
