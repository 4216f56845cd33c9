// `npm run bench`: runs every benchmark that exists, one after another, each printing its own figures.
// Benchmarks that need PostgreSQL get a private cluster (port 54349) started here.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const root = path.resolve(__dirname, '..');
const benchmarks = [
  { file: 'scripts/analysis/bench.ts', needsDatabase: false },
  { file: 'scripts/bench/capture-bench.ts', needsDatabase: false },
  { file: 'scripts/bench/sync-bench.ts', needsDatabase: true },
  { file: 'scripts/bench/review-bench.ts', needsDatabase: true },
  { file: 'scripts/bench/web-delivery-bench.ts', needsDatabase: true },
  { file: 'scripts/bench/clip-processing-bench.ts', needsDatabase: true },
];

type Cluster = { url: string; stop: () => void };

async function main(): Promise<void> {
  let cluster: Cluster | undefined;
  let failed = 0;
  for (const bench of benchmarks) {
    if (!fs.existsSync(path.join(root, bench.file))) continue;
    const env: NodeJS.ProcessEnv = { ...process.env };
    if (bench.needsDatabase) {
      if (!cluster) {
        const importEsm = new Function('s', 'return import(s)') as (s: string) => Promise<unknown>;
        const pg = (await importEsm(path.join(root, 'scripts/bootstrap/pg.mjs'))) as {
          startCluster: (o: {
            dataDir: string;
            port: number;
            database: string;
            log?: (m: string) => void;
          }) => Promise<Cluster>;
        };
        cluster = await pg.startCluster({
          dataDir: path.join(root, '.data/bench-pg'),
          port: Number(process.env.BENCH_PGPORT ?? 54349),
          database: 'fourpoint_bench',
          log: () => undefined,
        });
      }
      env.DATABASE_URL = cluster.url;
    }
    console.log(`\n== ${bench.file}`);
    const result = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [bench.file], {
      cwd: root,
      stdio: 'inherit',
      env,
    });
    if (result.status !== 0) failed++;
  }
  cluster?.stop();
  process.exitCode = failed ? 1 : 0;
}

main();
