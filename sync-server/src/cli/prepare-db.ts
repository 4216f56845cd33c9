// Brings a database up to date and loads the demo clinic once; `npm start` runs it before the server.
import path from 'node:path';
import { demoPassword } from '../config/secrets';
import { createSequelize } from '../db/database';
import { runMigrations } from '../db/migrator';
import { LocalDiskBlobStore } from '../services/blob-store';
import { seedDemo } from '../../seeders/demo';
import { analyseDemoClip } from '../../seeders/analyse-demo-clip';

const REPO_ROOT = path.resolve(__dirname, '../../..');
const oneLine = (error: unknown) =>
  (error instanceof Error ? error.message : String(error)).replace(/\s+/g, ' ').trim().replace(/\.$/, '');

async function main(): Promise<void> {
  const databaseUrl = process.env.DATABASE_URL;
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
    const blobDir = path.resolve(REPO_ROOT, process.env.BLOB_DIR ?? '.data/blobs');
    await seedDemo({
      sequelize,
      blobStore: new LocalDiskBlobStore(blobDir),
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
