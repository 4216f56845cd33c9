// Writes a brotli (.br) and a gzip (.gz) copy beside each compressible file of the web export, once at build
// time at the highest levels, so the server only picks a file (sync-server/src/web-export.ts) instead of
// compressing on every request.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import zlib from 'node:zlib';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

// Text, and binaries that are not compressed inside (wasm, TrueType fonts, icons). PNG and WOFF2 already are.
const compressible = /\.(html|js|mjs|css|json|webmanifest|map|svg|txt|wasm|ttf|otf|ico)$/;
// Below this the headers outweigh what compression saves.
const minimumBytes = 1024;

function filesUnder(dir) {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    return entry.isDirectory() ? filesUnder(full) : [full];
  });
}

export function compressWebExport({ dist = path.join(root, 'dist') } = {}) {
  let originalBytes = 0;
  let brotliBytes = 0;
  let files = 0;
  for (const file of filesUnder(dist)) {
    if (!compressible.test(file)) continue;
    const original = fs.readFileSync(file);
    if (original.length < minimumBytes) continue;
    const isText = !/\.(wasm|ttf|otf|ico)$/.test(file);
    const brotli = zlib.brotliCompressSync(original, {
      params: {
        [zlib.constants.BROTLI_PARAM_MODE]: isText
          ? zlib.constants.BROTLI_MODE_TEXT
          : zlib.constants.BROTLI_MODE_GENERIC,
        [zlib.constants.BROTLI_PARAM_QUALITY]: zlib.constants.BROTLI_MAX_QUALITY,
        [zlib.constants.BROTLI_PARAM_SIZE_HINT]: original.length,
      },
    });
    const gzip = zlib.gzipSync(original, { level: zlib.constants.Z_BEST_COMPRESSION });
    // A variant that saves nothing is left out; the server then sends the original.
    for (const [suffix, bytes] of [
      ['.br', brotli],
      ['.gz', gzip],
    ]) {
      if (bytes.length < original.length) fs.writeFileSync(file + suffix, bytes);
      else fs.rmSync(file + suffix, { force: true });
    }
    files++;
    originalBytes += original.length;
    brotliBytes += Math.min(brotli.length, original.length);
  }
  return { files, originalBytes, brotliBytes };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const dist = process.argv[2] ? path.resolve(process.argv[2]) : undefined;
  const { files, originalBytes, brotliBytes } = compressWebExport({ dist });
  const mb = (bytes) => (bytes / 1024 / 1024).toFixed(2);
  console.log(`compressed ${files} files: ${mb(originalBytes)} MB, ${mb(brotliBytes)} MB as brotli`);
}
