import path from 'node:path';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { createSequelize } from './database';

export const MIGRATIONS_DIR = path.resolve(__dirname, '../../migrations');
// Any two processes migrating the same database (start and test, two instances) take turns on this lock.
const MIGRATION_LOCK_KEY = 4_207_117;

export function createMigrator(sequelize: Sequelize): Umzug<QueryInterface> {
  return new Umzug({
    migrations: {
      glob: ['[0-9]*-*.ts', { cwd: MIGRATIONS_DIR }],
      resolve: ({ name, path: filePath, context }) => {
        const migration = require(filePath as string) as {
          up: (p: { name: string; context: QueryInterface }) => Promise<unknown>;
          down?: (p: { name: string; context: QueryInterface }) => Promise<unknown>;
        };
        return {
          name: name.replace(/\.ts$/, ''),
          up: () => migration.up({ name, context }),
          down: migration.down ? () => migration.down!({ name, context }) : undefined,
        };
      },
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'SequelizeMeta' }),
    logger: undefined,
  });
}

/** Runs every pending migration; a second run finds none and changes nothing. */
export async function runMigrations(databaseUrl: string): Promise<string[]> {
  const sequelize = createSequelize(databaseUrl, { poolMax: 2 });
  try {
    return await sequelize.transaction(async (transaction) => {
      await sequelize.query(`SELECT pg_advisory_xact_lock(${MIGRATION_LOCK_KEY})`, { transaction });
      const migrator = createMigrator(sequelize);
      const done = await migrator.up();
      return done.map((m) => m.name);
    });
  } finally {
    await sequelize.close();
  }
}
