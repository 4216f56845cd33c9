import type { Sequelize } from 'sequelize';

export async function databaseAnswers(sequelize: Sequelize): Promise<boolean> {
  try {
    await sequelize.query('SELECT 1');
    return true;
  } catch {
    return false;
  }
}
