// Makes the web export an installable, offline-capable app: a web manifest, and a Workbox service worker that
// precaches every file of the export, so after one online visit the app reloads with the network off.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateSW } from 'workbox-build';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

const registration = `<script>if ('serviceWorker' in navigator) { window.addEventListener('load', function () { navigator.serviceWorker.register('/sw.js').catch(function (e) { console.warn('Offline support unavailable:', e); }); }); }</script>`;

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
      `<link rel="manifest" href="/manifest.webmanifest" /><meta name="theme-color" content="${manifest.theme_color}" />${registration}</head>`,
    );
    fs.writeFileSync(indexFile, html);
  }

  const { count, size, warnings } = await generateSW({
    globDirectory: dist,
    globPatterns: ['**/*.{html,js,css,wasm,ttf,otf,woff,woff2,png,ico,svg,json,webmanifest}'],
    globIgnores: ['sw.js', 'workbox-*.js'],
    swDest: path.join(dist, 'sw.js'),
    // The export's entry bundle and expo-sqlite's wasm are a few MB; the default 2 MB limit would drop them.
    maximumFileSizeToCacheInBytes: 32 * 1024 * 1024,
    navigateFallback: '/index.html',
    navigateFallbackDenylist: [/^\/api\//],
    skipWaiting: true,
    clientsClaim: true,
    cleanupOutdatedCaches: true,
    inlineWorkboxRuntime: true,
    sourcemap: false,
    mode: 'production',
  });
  for (const warning of warnings) console.warn(`service worker: ${warning}`);
  return { count, size };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const { count, size } = await buildPwa();
  console.log(`service worker: ${count} files precached (${(size / 1024 / 1024).toFixed(1)} MB)`);
}
