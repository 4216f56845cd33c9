// Makes the web export an installable, offline-capable app: a web manifest, and a Workbox service worker that
// precaches every file of the export, so after one online visit the app reloads with the network off.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateSW } from 'workbox-build';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

// Paths the server answers itself (the API, webhooks, pages it renders such as the payment return): a navigation
// there must reach the network, never the cached app shell. tests/server/access-table.test.ts checks that every
// route outside the app lies under one of them.
const serverPathPrefixes = JSON.parse(
  fs.readFileSync(path.join(root, 'shared/web/server-paths.json'), 'utf8'),
);
const escapeRegExp = (text) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

export async function buildPwa({ dist = path.join(root, 'dist') } = {}) {
  const app = JSON.parse(fs.readFileSync(path.join(root, 'app.json'), 'utf8')).expo;
  fs.mkdirSync(path.join(dist, 'icons'), { recursive: true });
  fs.copyFileSync(path.join(root, 'assets/images/icon.png'), path.join(dist, 'icons/icon-192.png'));
  const manifest = {
    name: app.web?.name ?? app.name,
    short_name: app.web?.shortName ?? app.name,
    start_url: '/',
    scope: '/',
    display: 'standalone',
    orientation: 'any',
    theme_color: app.web?.themeColor ?? '#12343B',
    background_color: app.web?.backgroundColor ?? '#F6F3EC',
    icons: [{ src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' }],
  };
  fs.writeFileSync(path.join(dist, 'manifest.webmanifest'), JSON.stringify(manifest, null, 2));

  const indexFile = path.join(dist, 'index.html');
  let html = fs.readFileSync(indexFile, 'utf8');
  if (!html.includes('rel="manifest"')) {
    html = html.replace(
      '</head>',
      `<link rel="manifest" href="/manifest.webmanifest" /><meta name="theme-color" content="${manifest.theme_color}" /></head>`,
    );
    fs.writeFileSync(indexFile, html);
  }

  preloadFonts({ dist, indexFile });

  const { count, size, warnings } = await generateSW({
    globDirectory: dist,
    globPatterns: ['**/*.{html,js,css,wasm,ttf,otf,woff,woff2,png,ico,svg,json,webmanifest}'],
    globIgnores: ['sw.js', 'workbox-*.js'],
    swDest: path.join(dist, 'sw.js'),
    // The export's entry bundle and expo-sqlite's wasm are a few MB; the default 2 MB limit would drop them.
    maximumFileSizeToCacheInBytes: 32 * 1024 * 1024,
    // Expo names bundles and assets after their content: such a file is cached under its own URL, with no
    // revision query. Besides saving a lookup, this lets Chromium use the code cache it makes for a script while
    // the worker installs (a script cached under another URL than the page asks for runs without it).
    dontCacheBustURLsMatching: /[.-][0-9a-f]{32}[.@]/,
    navigateFallback: '/index.html',
    navigateFallbackDenylist: serverPathPrefixes.map((prefix) => new RegExp(`^${escapeRegExp(prefix)}`)),
    // A new version waits until the person reloads (features/root/update-banner.tsx announces it and sends
    // SKIP_WAITING, which Workbox's generated worker obeys): taking over a running page would change its files
    // under it. The app registers this worker itself, once its first screen is up (service-worker.web.ts).
    skipWaiting: false,
    clientsClaim: true,
    cleanupOutdatedCaches: true,
    inlineWorkboxRuntime: true,
    sourcemap: false,
    mode: 'production',
  });
  for (const warning of warnings) console.warn(`service worker: ${warning}`);
  return { count, size };
}

// The app waits for its fonts before its first screen, and would only ask for them once its bundles have run:
// preloading lets them download beside the bundles instead of after them. `crossorigin` because fonts are
// always fetched in CORS mode, and a preload fetched otherwise would not be reused (HTML, "link type preload").
function preloadFonts({ dist, indexFile }) {
  const fontTypes = { '.woff2': 'font/woff2', '.woff': 'font/woff', '.ttf': 'font/ttf', '.otf': 'font/otf' };
  const fonts = [];
  const walk = (dir) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (fontTypes[path.extname(entry.name)]) fonts.push(full);
    }
  };
  walk(path.join(dist, 'assets'));
  let html = fs.readFileSync(indexFile, 'utf8').replace(/<link rel="preload" as="font"[^>]*>/g, '');
  const links = fonts
    .sort()
    .map((file) => {
      const href = `/${path.relative(dist, file).split(path.sep).join('/')}`;
      return `<link rel="preload" as="font" type="${fontTypes[path.extname(file)]}" href="${href}" crossorigin />`;
    })
    .join('');
  html = html.replace('</head>', `${links}</head>`);
  fs.writeFileSync(indexFile, html);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const { count, size } = await buildPwa();
  console.log(`service worker: ${count} files precached (${(size / 1024 / 1024).toFixed(1)} MB)`);
}
