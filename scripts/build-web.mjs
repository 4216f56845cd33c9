// Builds the web export into dist/, skipping the build when dist/ is newer than every input.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dist = path.join(root, 'dist');
const marker = path.join(dist, 'index.html');
const inputDirs = ['app', 'features', 'ui', 'device', 'api', 'shared', 'assets', 'public', 'scripts/metro'];
const inputFiles = [
  'app.json',
  'metro.config.js',
  'tsconfig.json',
  'package.json',
  'package-lock.json',
  'babel.config.js',
];

function newestMtime(target) {
  let stat;
  try {
    stat = fs.statSync(target);
  } catch {
    return 0;
  }
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) {
    if (entry === 'node_modules' || entry.startsWith('.')) continue;
    newest = Math.max(newest, newestMtime(path.join(target, entry)));
  }
  return newest;
}

function upToDate() {
  if (!fs.existsSync(marker)) return false;
  const built = fs.statSync(marker).mtimeMs;
  const inputs = [...inputDirs, ...inputFiles].map((p) => newestMtime(path.join(root, p)));
  return Math.max(...inputs) < built;
}

// The workers (Metro cannot bundle workers or worklets) and the offline layer (manifest, service worker) go on
// top; compression comes last, since the offline layer rewrites index.html.
async function addWorkerAndOfflineLayer() {
  const { buildWorker } = await import('./build-worker.mjs');
  const { buildPwa } = await import('./build-pwa.mjs');
  const { compressWebExport } = await import('./compress-web.mjs');
  await buildWorker({ outDir: dist });
  const { count } = await buildPwa({ dist });
  // The marker counts as newer than every input even when the export reused cached files.
  const now = new Date();
  fs.utimesSync(marker, now, now);
  const { files } = compressWebExport({ dist });
  console.log(`Workers bundled; service worker precaches ${count} files; ${files} files precompressed.`);
}

const force = process.argv.includes('--force');
if (!force && upToDate()) {
  const layerFiles = ['sw.js', 'workers/analysis.js', 'workers/recorder-tap.js', 'index.html.br'];
  if (layerFiles.some((file) => !fs.existsSync(path.join(dist, file)))) {
    await addWorkerAndOfflineLayer();
  }
  console.log('Web export is up to date (dist/).');
  process.exit(0);
}

console.log('Building the web export into dist/ ...');
const started = Date.now();
const result = spawnSync('npx', ['expo', 'export', '--platform', 'web', '--output-dir', 'dist'], {
  cwd: root,
  env: { ...process.env, CI: '1', EXPO_NO_TELEMETRY: '1' },
  encoding: 'utf8',
  maxBuffer: 64 * 1024 * 1024,
});
if (result.status !== 0 || !fs.existsSync(marker)) {
  const output = `${result.stdout ?? ''}\n${result.stderr ?? ''}`;
  fs.mkdirSync(path.join(root, '.data'), { recursive: true });
  const logFile = path.join(root, '.data', 'build-web.log');
  fs.writeFileSync(logFile, output);
  const firstError =
    output
      .split('\n')
      .find((line) => /error/i.test(line))
      ?.trim() ?? 'see the log';
  console.error(`Web export failed: ${firstError.slice(0, 300)} (full log: ${path.relative(root, logFile)})`);
  process.exit(1);
}
await addWorkerAndOfflineLayer();
console.log(`Web export built in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
