import { Sequelize } from 'sequelize';

export function createSequelize(
  databaseUrl: string,
  options: {
    poolMax?: number;
    /** Names the connections in pg_stat_activity (main.ts: the instance), so a query can be traced to its process. */
    applicationName?: string;
  } = {},
): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    logging: false,
    pool: { max: options.poolMax ?? 10, acquire: 10_000 },
    define: { underscored: true },
    ...(options.applicationName ? { dialectOptions: { application_name: options.applicationName } } : {}),
  });
}
