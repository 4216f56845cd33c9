// Server tests run against a real PostgreSQL. `npm test` starts a private cluster and passes DATABASE_URL;
// a bare `npx jest` starts one here, so a contributor can run one test file on its own.
import path from 'node:path';

type Cluster = { url: string; stop: () => void };

// A real dynamic import: ts-jest would otherwise turn `import()` into `require()` of an ES module.
const importEsm = new Function('specifier', 'return import(specifier)') as (s: string) => Promise<unknown>;

export default async function globalSetup(): Promise<void> {
  // A fresh set of secrets per run, in the environment the test workers and any server they spawn inherit.
  const { newSecrets } = (await importEsm(path.join(__dirname, '../../scripts/bootstrap/secrets.mjs'))) as {
    newSecrets: () => Record<string, string>;
  };
  Object.assign(process.env, newSecrets());
  if (!process.env.DATABASE_URL) {
    const pg = (await importEsm(path.join(__dirname, '../../scripts/bootstrap/pg.mjs'))) as {
      startCluster: (o: {
        dataDir: string;
        port: number;
        database: string;
        fsync: boolean;
        log?: (m: string) => void;
      }) => Promise<Cluster>;
    };
    const cluster = await pg.startCluster({
      dataDir: process.env.FOURPOINT_TEST_PG_DIR ?? path.join(__dirname, '../../.data/test-pg'),
      port: Number(process.env.TEST_PGPORT ?? 54339),
      database: 'fourpoint_test',
      // A throwaway cluster: speed over crash safety.
      fsync: false,
      log: () => undefined,
    });
    process.env.DATABASE_URL = cluster.url;
    (globalThis as { __fourpointCluster?: Cluster }).__fourpointCluster = cluster;
  }
  const { runMigrations } = await import('../../sync-server/src/db/migrator');
  await runMigrations(process.env.DATABASE_URL);
}
