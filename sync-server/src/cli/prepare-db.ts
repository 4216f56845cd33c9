// Brings a database up to date and loads the demo clinic once; `npm start` runs it before the server.
import { demoPassword } from '../config/secrets';
import { loadConfig } from '../config/settings';
import { createSequelize } from '../db/database';
import { runMigrations } from '../db/migrator';
import { LocalDiskBlobStore } from '../services/blob-store';
import { seedDemo } from '../../seeders/demo';
import { analyseDemoClip } from '../../seeders/analyse-demo-clip';

const oneLine = (error: unknown) =>
  (error instanceof Error ? error.message : String(error)).replace(/\s+/g, ' ').trim().replace(/\.$/, '');

async function main(): Promise<void> {
  const config = loadConfig();
  const databaseUrl = config.DATABASE_URL;
  if (!databaseUrl) {
    console.error(
      'DATABASE_URL is not set: run `npm start`, which sets up the database, or set it yourself.',
    );
    process.exit(1);
  }
  try {
    await runMigrations(databaseUrl);
  } catch (error) {
    console.error(`Database migration failed: ${oneLine(error)}. Fix it, or delete .data/ to start over.`);
    process.exit(1);
  }
  const sequelize = createSequelize(databaseUrl, { poolMax: 2 });
  try {
    await seedDemo({
      sequelize,
      blobStore: new LocalDiskBlobStore(config.BLOB_DIR),
      password: demoPassword(),
      analyse: analyseDemoClip,
      log: console.log,
    });
  } catch (error) {
    console.error(`Loading the demo data failed: ${oneLine(error)}. Fix it, or delete .data/ to start over.`);
    process.exitCode = 1;
  } finally {
    await sequelize.close();
  }
}

void main();
