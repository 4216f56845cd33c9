// Server tests run against a real PostgreSQL. `npm test` starts a private cluster and passes DATABASE_URL;
// a bare `npx jest` starts one here, so a contributor can run one test file on its own.
import path from 'node:path';

type Cluster = { url: string; stop: () => void };

export default async function globalSetup(): Promise<void> {
  if (!process.env.DATABASE_URL) {
    // A real dynamic import: ts-jest would otherwise turn `import()` into `require()` of an ES module.
    const importEsm = new Function('specifier', 'return import(specifier)') as (
      s: string,
    ) => Promise<unknown>;
    const pg = (await importEsm(path.join(__dirname, '../../scripts/bootstrap/pg.mjs'))) as {
      startCluster: (o: {
        dataDir: string;
        port: number;
        database: string;
        log?: (m: string) => void;
      }) => Promise<Cluster>;
    };
    const cluster = await pg.startCluster({
      dataDir: process.env.FOURPOINT_TEST_PG_DIR ?? path.join(__dirname, '../../.data/test-pg'),
      port: Number(process.env.TEST_PGPORT ?? 54339),
      database: 'fourpoint_test',
      log: () => undefined,
    });
    process.env.DATABASE_URL = cluster.url;
    (globalThis as { __fourpointCluster?: Cluster }).__fourpointCluster = cluster;
  }
  const { runMigrations } = await import('../../sync-server/src/db/migrator');
  await runMigrations(process.env.DATABASE_URL);
}
