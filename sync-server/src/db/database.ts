import { Sequelize } from 'sequelize';

export function createSequelize(databaseUrl: string, options: { poolMax?: number } = {}): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: false,
    pool: { max: options.poolMax ?? 10, acquire: 10_000 },
    define: { underscored: true },
  });
}
