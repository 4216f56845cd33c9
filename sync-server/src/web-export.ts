// Serves the web export (dist/) beside the API: precompressed files by content negotiation, long caching for
// content-hashed files, and the app shell for every route of the single-page app.
import fs from 'node:fs';
import path from 'node:path';
import type { Express, Request, Response } from 'express';
import { AppError } from './errors';

// Cross-origin isolation lets the web app's SQLite use SharedArrayBuffer (see STACK.md).
const isolationHeaders = {
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Embedder-Policy': 'require-corp',
  'Cross-Origin-Resource-Policy': 'same-origin',
} as const;

/**
 * The variants `scripts/compress-web.mjs` writes beside each text file, in the server's order of preference:
 * brotli is smaller than gzip for the same file, so it wins whenever the browser accepts both.
 */
export const precompressedEncodings = [
  { encoding: 'br', suffix: '.br' },
  { encoding: 'gzip', suffix: '.gz' },
] as const;

// Expo's export names every bundle and asset after the MD5 of its content (`entry-<32 hex>.js`,
// `Inter_400Regular.<32 hex>.ttf`, `icon.<32 hex>@2x.png`): a new build gives a new name, never new bytes.
const contentHash = /[.-][0-9a-f]{32}(?=[.@])/;

export const immutableCacheControl = 'public, max-age=31536000, immutable';

/** Content-hashed files may be kept for a year; anything else (index.html, sw.js, the worker) is revalidated. */
export function cacheControlFor(filePath: string): string {
  return contentHash.test(path.basename(filePath)) ? immutableCacheControl : 'no-cache';
}

function setCommonHeaders(res: Response, filePath: string): void {
  for (const [name, value] of Object.entries(isolationHeaders)) res.setHeader(name, value);
  res.setHeader('Cache-Control', cacheControlFor(filePath));
}

async function modifiedAtMs(file: string): Promise<number | undefined> {
  try {
    const stat = await fs.promises.stat(file);
    return stat.isFile() ? stat.mtimeMs : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Sends `file` (inside `root`), as a precompressed variant when the browser accepts one that exists. A variant
 * older than its original (the original was rewritten after compression) is ignored rather than served stale.
 * Returns false when `file` does not exist, so the caller can fall through.
 */
async function sendWebFile(req: Request, res: Response, root: string, file: string): Promise<boolean> {
  const originalModified = await modifiedAtMs(file);
  if (originalModified === undefined) return false;

  let chosen: { encoding: string; path: string } | undefined;
  let hasVariant = false;
  for (const { encoding, suffix } of precompressedEncodings) {
    const variantModified = await modifiedAtMs(file + suffix);
    if (variantModified === undefined || variantModified < originalModified) continue;
    hasVariant = true;
    // acceptsEncodings honours q=0 refusals and `*`; among the accepted ones the server's order decides.
    if (!chosen && req.acceptsEncodings(encoding) === encoding) chosen = { encoding, path: file + suffix };
  }

  setCommonHeaders(res, file);
  if (hasVariant) res.vary('Accept-Encoding');
  // The type of the original, not of the .br/.gz file: `send` keeps a Content-Type that is already set.
  res.type(path.extname(file));
  if (chosen) res.setHeader('Content-Encoding', chosen.encoding);
  const relative = path.relative(root, chosen?.path ?? file);
  return new Promise<boolean>((resolve, reject) => {
    res.sendFile(relative, { root, cacheControl: false }, (error) => {
      // A browser that went away mid-file has nothing more to be told.
      if (!error || res.headersSent) resolve(true);
      else if ((error as { status?: number }).status === 404) {
        // Gone since it was looked at (a rebuild): let the caller answer, without this file's headers.
        for (const header of ['Content-Encoding', 'Content-Type', 'Vary', 'Cache-Control'])
          res.removeHeader(header);
        resolve(false);
      } else reject(error);
    });
  });
}

/** The file a request path names inside `root`, or undefined for a path that is malformed or leaves it. */
function fileForRequestPath(root: string, requestPath: string): string | undefined {
  let decoded: string;
  try {
    decoded = decodeURIComponent(requestPath);
  } catch {
    return undefined;
  }
  // Dot-files (a stray .env, editor files) are never part of the export.
  if (decoded.includes('\0') || decoded.split('/').some((segment) => segment.startsWith('.')))
    return undefined;
  const file = path.join(root, decoded.endsWith('/') ? `${decoded}index.html` : decoded);
  return file.startsWith(root + path.sep) ? file : undefined;
}

export function serveWebExport(app: Express, webDist: string): void {
  const root = path.resolve(webDist);
  const indexHtml = path.join(root, 'index.html');

  app.get('/{*splat}', async (req, res, next) => {
    try {
      if (req.path.startsWith('/api/')) throw new AppError('not_found', 'Not found.', 404);
      const file = fileForRequestPath(root, req.path);
      if (file && (await sendWebFile(req, res, root, file))) return;
      // A missing file (it has an extension) is a 404, not the app shell.
      if (path.extname(req.path) !== '') throw new AppError('not_found', 'Not found.', 404);
      if (!(await sendWebFile(req, res, root, indexHtml))) throw new AppError('not_found', 'Not found.', 404);
    } catch (error) {
      next(error);
    }
  });
}
