// Metro cannot bundle Web Workers, so the analysis worker is bundled here with esbuild (tsx's own dependency).
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export async function buildWorker({ outDir = path.join(root, 'dist') } = {}) {
  const outfile = path.join(outDir, 'workers/analysis.js');
  await build({
    entryPoints: [path.join(root, 'hooks/analysis-worker/worker-entry.ts')],
    outfile,
    bundle: true,
    format: 'iife',
    platform: 'browser',
    target: 'es2020',
    minify: true,
    sourcemap: false,
    tsconfig: path.join(root, 'tsconfig.json'),
    logLevel: 'warning',
  });
  return outfile;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const file = await buildWorker();
  console.log(`analysis worker: ${path.relative(root, file)}`);
}
