// Metro cannot bundle Web Workers or worklets, so they are bundled here with esbuild (tsx's own dependency).
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

// Each entry becomes dist/workers/<name>.js, loaded from this origin (the Content-Security-Policy allows scripts,
// workers and worklets only from 'self'): the analysis Web Worker, and the recorder's audio-worklet tap.
const entries = {
  analysis: 'device/analysis-worker/worker-entry.ts',
  'recorder-tap': 'device/recorder/tap-worklet.ts',
};

export async function buildWorker({ outDir = path.join(root, 'dist') } = {}) {
  const outfiles = [];
  for (const [name, entry] of Object.entries(entries)) {
    const outfile = path.join(outDir, `workers/${name}.js`);
    await build({
      entryPoints: [path.join(root, entry)],
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
    outfiles.push(outfile);
  }
  return outfiles;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const files = await buildWorker();
  console.log(`workers: ${files.map((file) => path.relative(root, file)).join(', ')}`);
}
