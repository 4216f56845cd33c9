// What the operator's phone moves to reach the sign-in form: the built web export (dist/) served by the real
// server, opened in Debian's Chromium at a phone's size on an emulated slow link (1.6 Mbit/s down, 750 kbit/s
// up, 150 ms latency: Lighthouse's "slow 4G" mobile profile, set through the DevTools protocol's
// Network.emulateNetworkConditions). Two visits: a cold one (empty cache, no service worker) and a repeat one
// once the service worker has precached the export. Targets: cold ≤ 1 MB and ≤ 6 s, repeat ≤ 100 KB and ≤ 1 s.
//
// Bytes are counted where they leave the server (every socket's bytesWritten, headers included), so they hold
// the service worker's own downloads too; the emulation slows the page's requests, not the service worker's.
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo, Socket } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import type { CDPSession, Page } from 'playwright-core';
import { composeServices } from '@/sync-server/src/composition-root';
import { loadConfig } from '@/sync-server/src/config/settings';
import { createApp } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { runMigrations } from '@/sync-server/src/db/migrator';
import { launchBrowser, PHONE } from '@/tests/support/browser';

const root = path.resolve(__dirname, '../..');
const webDist = path.join(root, 'dist');
const slowLink = {
  offline: false,
  latency: 150,
  downloadThroughput: (1.6 * 1_000_000) / 8,
  uploadThroughput: (0.75 * 1_000_000) / 8,
};
const targets = { cold: { bytes: 1_000_000, ms: 6000 }, repeat: { bytes: 100_000, ms: 1000 } };

function byteCounter(server: http.Server): () => number {
  const sockets = new Set<Socket>();
  server.on('connection', (socket) => sockets.add(socket));
  let before = 0;
  return () => {
    const total = [...sockets].reduce((sum, socket) => sum + socket.bytesWritten, 0);
    const moved = total - before;
    before = total;
    return moved;
  };
}

interface PageTraffic {
  responses: { url: string; bytes: number; encoding: string; fromServiceWorker: boolean }[];
}

/** The page's own requests as the DevTools protocol sees them: bytes on the wire and how each was encoded. */
async function watchTraffic(cdp: CDPSession): Promise<PageTraffic> {
  const traffic: PageTraffic = { responses: [] };
  const pending = new Map<string, { url: string; encoding: string; fromServiceWorker: boolean }>();
  cdp.on('Network.responseReceived', (event) => {
    const headers = event.response.headers as Record<string, string>;
    const encoding =
      Object.entries(headers).find(([name]) => name.toLowerCase() === 'content-encoding')?.[1] ?? 'identity';
    pending.set(event.requestId, {
      url: event.response.url,
      encoding,
      fromServiceWorker: Boolean(event.response.fromServiceWorker),
    });
  });
  cdp.on('Network.loadingFinished', (event) => {
    const response = pending.get(event.requestId);
    if (response) traffic.responses.push({ ...response, bytes: event.encodedDataLength });
  });
  await cdp.send('Network.enable');
  await cdp.send('Network.emulateNetworkConditions', slowLink);
  return traffic;
}

// Run in the page as a plain string (the bench's compiler would wrap a function with helpers the page lacks).
// It watches for the form itself rather than through Playwright's selector engine, whose own script is large
// enough that compiling it on the page's main thread delayed the app it was timing (0.45 s at load 19).
const signInFormOnScreen = `new Promise((resolve) => {
  const form = () => document.querySelector('[data-testid="sign-in-email"]');
  const painted = () => requestAnimationFrame(() => resolve(performance.now()));
  if (form()) return painted();
  const watch = new MutationObserver(() => {
    if (!form()) return;
    watch.disconnect();
    painted();
  });
  watch.observe(document, { childList: true, subtree: true });
})`;

/** Milliseconds from the start of navigation to the sign-in form on screen, by the page's own clock. */
async function timeToSignInForm(page: Page, url: string): Promise<number> {
  await page.goto(url, { waitUntil: 'commit' });
  const ms = (await page.evaluate(signInFormOnScreen)) as number;
  // The form must also be what a person sees, not merely in the document.
  await page.getByTestId('sign-in-email').waitFor({ state: 'visible', timeout: 60_000 });
  return ms;
}

const kb = (bytes: number) => `${(bytes / 1000).toFixed(0)} kB`;
const verdict = (value: number, limit: number) => (value <= limit ? 'within' : 'OVER');

async function main(): Promise<void> {
  if (!fs.existsSync(path.join(webDist, 'index.html')))
    throw new Error('dist/ is missing: run node scripts/build-web.mjs first.');
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) throw new Error('DATABASE_URL is not set: run through npm run bench.');
  await runMigrations(databaseUrl);
  const sequelize = createSequelize(databaseUrl, { poolMax: 5 });
  const app = createApp({
    sequelize,
    jwtSecret: 'bench-only-secret',
    services: composeServices(loadConfig(), sequelize),
    webDist,
    logger: pino({ level: 'silent' }),
  });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const bytesSinceLastAsked = byteCounter(server);
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/sign-in`;

  const browser = await launchBrowser();
  try {
    const context = await browser.newContext({ viewport: PHONE, deviceScaleFactor: 3, isMobile: true });

    const cold = await context.newPage();
    const coldTraffic = await watchTraffic(await context.newCDPSession(cold));
    const coldMs = await timeToSignInForm(cold, url);
    const coldBytes = bytesSinceLastAsked();
    const coldPageBytes = coldTraffic.responses.reduce((sum, r) => sum + r.bytes, 0);
    // The service worker registers on load and precaches the export; the repeat visit needs it in control.
    await cold.evaluate(async () => {
      await navigator.serviceWorker.ready;
    });
    await cold.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, {
      timeout: 120_000,
    });
    const precacheBytes = bytesSinceLastAsked();
    await cold.close();

    const repeat = await context.newPage();
    const repeatTraffic = await watchTraffic(await context.newCDPSession(repeat));
    const repeatMs = await timeToSignInForm(repeat, url);
    const repeatBytes = bytesSinceLastAsked();
    await repeat.close();

    // Offline after one online visit: the shell and every bundle chunk (the operator's screens among them)
    // must come from the precache.
    const chunks = fs.readdirSync(path.join(webDist, '_expo/static/js/web')).filter((f) => f.endsWith('.js'));
    const offline = await context.newPage();
    await context.setOffline(true);
    await offline.goto(url);
    await offline.getByTestId('sign-in-email').waitFor({ state: 'visible', timeout: 60_000 });
    const cachedPaths = await offline.evaluate(async () => {
      const paths: string[] = [];
      for (const name of await caches.keys())
        for (const request of await (await caches.open(name)).keys())
          paths.push(new URL(request.url).pathname);
      return paths;
    });
    const uncached = chunks.filter((chunk) => !cachedPaths.includes(`/_expo/static/js/web/${chunk}`));
    await context.setOffline(false);
    await offline.close();

    const encodings = new Map<string, number>();
    for (const r of coldTraffic.responses)
      encodings.set(r.encoding, (encodings.get(r.encoding) ?? 0) + r.bytes);
    const byFile = [...coldTraffic.responses].sort((a, b) => b.bytes - a.bytes);
    const fromNetworkOnRepeat = repeatTraffic.responses.filter((r) => !r.fromServiceWorker);

    console.log(
      `link: ${(slowLink.downloadThroughput * 8e-6).toFixed(1)} Mbit/s down, ${slowLink.latency} ms latency; ${PHONE.width}×${PHONE.height}`,
    );
    // The times include the page's own script work, which the link emulation does not slow but a busy machine
    // does: a load well above the number of cores makes them say more about the machine than about the app.
    console.log(
      `machine: load ${os.loadavg()[0].toFixed(1)} (1-minute average) on ${os.cpus().length} cores during the visits`,
    );
    console.log(
      `cold visit to the sign-in form: ${kb(coldBytes)} from the server (page's own requests ${kb(coldPageBytes)}) ` +
        `in ${(coldMs / 1000).toFixed(2)} s; targets ≤ ${kb(targets.cold.bytes)} (${verdict(coldBytes, targets.cold.bytes)}) ` +
        `and ≤ ${targets.cold.ms / 1000} s (${verdict(coldMs, targets.cold.ms)})`,
    );
    console.log(`  by encoding: ${[...encodings].map(([name, bytes]) => `${name} ${kb(bytes)}`).join(', ')}`);
    console.log('  by file:');
    for (const r of byFile)
      console.log(`    ${kb(r.bytes).padStart(7)} ${r.encoding.padEnd(8)} ${new URL(r.url).pathname}`);
    console.log(`then the service worker's precache: ${kb(precacheBytes)} more`);
    console.log(
      `repeat visit with the service worker warm: ${kb(repeatBytes)} from the server in ${(repeatMs / 1000).toFixed(2)} s; ` +
        `targets ≤ ${kb(targets.repeat.bytes)} (${verdict(repeatBytes, targets.repeat.bytes)}) and ≤ ${targets.repeat.ms / 1000} s ` +
        `(${verdict(repeatMs, targets.repeat.ms)}); requests past the service worker: ` +
        (fromNetworkOnRepeat.map((r) => new URL(r.url).pathname).join(', ') || 'none'),
    );
    console.log(
      `offline after one visit: sign-in form shown with the network off; ${chunks.length - uncached.length} of ` +
        `${chunks.length} bundle chunks precached${uncached.length ? ` (missing: ${uncached.join(', ')})` : ''}`,
    );
    if (uncached.length) process.exitCode = 1;
  } finally {
    await browser.close();
    server.close();
    await sequelize.close();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exitCode = 1;
});
