// The Content-Security-Policy the web app runs under (OWASP ASVS 4.0.3 V14.4.3, V14.4.7). One policy for every
// answer: the app shell, its static files (workers take their policy from their own script's answer) and the API.
// tests/e2e/csp.e2e.ts walks each role's main screens in Chromium and fails on any violation, so an allowance
// that is missing shows there; each allowance below says what needs it.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { HelmetOptions } from 'helmet';

type CspOptions = Exclude<HelmetOptions['contentSecurityPolicy'], boolean | undefined>;

/** The `'sha256-…'` sources of the inline scripts of an HTML page, as CSP Level 3 (§ 8.4) hashes them. */
export function inlineScriptHashes(html: string): string[] {
  // The page is our own build's output (it has no inline script today: the app registers its service worker
  // itself); a pattern is enough for it. Scripts with a src are covered by 'self'.
  const inline = /<script\b([^>]*)>([\s\S]*?)<\/script\s*>/gi;
  const hashes = new Set<string>();
  for (const [, attributes, body] of html.matchAll(inline)) {
    if (/\bsrc\s*=/i.test(attributes ?? '') || !body) continue;
    hashes.add(`'sha256-${createHash('sha256').update(body, 'utf8').digest('base64')}'`);
  }
  return [...hashes];
}

/**
 * Hashes of the export's index.html as it is on disk now: read again whenever the file changes, so a rebuild
 * while the server runs cannot leave the page's own inline script blocked.
 */
function indexHtmlScriptHashes(indexHtml: string | undefined): () => string[] {
  let seen: { mtimeMs: number; size: number; hashes: string[] } | undefined;
  return () => {
    if (!indexHtml) return [];
    const stat = fs.statSync(indexHtml, { throwIfNoEntry: false });
    if (!stat) return [];
    if (seen?.mtimeMs !== stat.mtimeMs || seen.size !== stat.size) {
      seen = {
        mtimeMs: stat.mtimeMs,
        size: stat.size,
        hashes: inlineScriptHashes(fs.readFileSync(indexHtml, 'utf8')),
      };
    }
    return seen.hashes;
  };
}

/** helmet's contentSecurityPolicy options for the app, with the web export in `webDist` (if served). */
export function contentSecurityPolicy(webDist?: string): CspOptions {
  const scriptHashes = indexHtmlScriptHashes(webDist && path.join(path.resolve(webDist), 'index.html'));
  return {
    // Every directive is listed here; helmet's defaults allow https: styles and fonts we do not use.
    useDefaults: false,
    directives: {
      defaultSrc: ["'self'"],
      scriptSrc: [
        () =>
          [
            "'self'",
            // expo-sqlite compiles its SQLite build (wa-sqlite.wasm) in its worker; without this the browser
            // refuses WebAssembly compilation. It allows wasm only, not eval() or new Function().
            "'wasm-unsafe-eval'",
            // The inline scripts of index.html, if a build adds any, by hash.
            ...scriptHashes(),
          ].join(' '),
      ],
      // No inline event handlers (onclick="…") anywhere: React attaches listeners from script.
      scriptSrcAttr: ["'none'"],
      // 'unsafe-inline' for styles: react-native-web and expo-font create <style> elements at run time (the
      // react-native-web sheet, the @font-face rules of the app's fonts) and fill them with text that depends on
      // the screen, which a hash cannot name, and neither library takes a nonce; the export's index.html has an
      // inline reset too. Styles cannot run script, which stays without 'unsafe-inline'.
      styleSrc: ["'self'", "'unsafe-inline'"],
      // The app's fonts (Fontsource WOFF2, features/root/app-fonts.web.ts) are files of the export.
      fontSrc: ["'self'"],
      // blob: the clip the operator plays back and the practitioner's review audio are object URLs, because
      // the audio is in memory or fetched with the bearer token an <audio> element cannot send.
      mediaSrc: ["'self'", 'blob:'],
      // data: the clinic's logo is kept and previewed as a data: URL (admin settings), and react-native-web draws
      // its check box's mark from one.
      imgSrc: ["'self'", 'data:'],
      // The API, tus uploads, the service worker's precache and expo-sqlite's wasm are all on this origin.
      connectSrc: ["'self'"],
      // The analysis worker, expo-sqlite's OPFS worker and the Workbox service worker are files of the export.
      // blob: Expo's Metro runtime starts a bundled worker (expo-sqlite's) from a blob: shim whenever the page is
      // cross-origin isolated, as ours is (unstable_createWorker in expo/src/async-require/asyncRequireModule.ts);
      // the shim only importScripts() the worker's file from this origin. A blob: worker inherits this policy,
      // so what it loads is still held to script-src, and only script already running here can make one.
      workerSrc: ["'self'", 'blob:'],
      manifestSrc: ["'self'"],
      objectSrc: ["'none'"],
      baseUri: ["'self'"],
      formAction: ["'self'"],
      frameAncestors: ["'none'"],
      // No upgrade-insecure-requests: every request is to this origin, so it would add nothing over HTTPS and
      // would break a plain-HTTP local run.
    },
  };
}
