// A new version of the web app, as the phone meets it: the real server serves a copy of the web export, the app
// registers its service worker, then the copy's sw.js changes as a deployment would change it. Per the Service
// Workers specification (W3C, "Update" and "Install" algorithms) a byte-different script is a new version: the
// browser installs it beside the running one, and it waits. The app must say so in words, must not reload by
// itself, and must reload into the new version when the person presses Reload.
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import { composeServices } from '@/sync-server/src/composition-root';
import { loadConfig } from '@/sync-server/src/config/settings';
import { createApp } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { browserForThisFile, PHONE, screenshot, trackPage } from '@/tests/support/browser';
import { visible } from './helpers/operator';

jest.setTimeout(180_000);

const browser = browserForThisFile();
const root = path.resolve(__dirname, '../..');

let webDist: string;
let server: http.Server;
let sequelize: ReturnType<typeof createSequelize>;
let baseUrl: string;

beforeAll(async () => {
  const databaseUrl = process.env.E2E_DATABASE_URL;
  if (!databaseUrl) throw new Error('E2E_DATABASE_URL is not set: run the e2e tests through jest.');
  // A copy, so the change of version below touches nothing the other tests are served.
  webDist = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-update-'));
  fs.cpSync(path.join(root, 'dist'), webDist, { recursive: true });
  sequelize = createSequelize(databaseUrl, { poolMax: 2 });
  const app = createApp({
    sequelize,
    jwtSecret: 'app-update-e2e-only',
    services: composeServices(loadConfig(), sequelize),
    webDist,
    logger: pino({ level: 'silent' }),
  });
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await sequelize?.close();
  if (webDist) fs.rmSync(webDist, { recursive: true, force: true });
});

test('when a new version is deployed while the app is open, then it is announced in words and loads only when the person reloads', async () => {
  const context = await browser().newContext({ viewport: PHONE, baseURL: baseUrl });
  const page = trackPage(await context.newPage());
  await page.goto('/sign-in');
  await visible(page, 'sign-in-email').waitFor();
  // The first service worker of a visit serves the page from then on; it is not a new version.
  await page.waitForFunction(() => Boolean(navigator.serviceWorker.controller), undefined, {
    timeout: 60_000,
  });
  expect(await page.getByTestId('update-banner').count()).toBe(0);

  // The deployment: a new sw.js (its compressed copies are now older than it, so the server ignores them).
  const swFile = path.join(webDist, 'sw.js');
  fs.appendFileSync(swFile, `\n// the next version, ${Date.now()}\n`);
  const newVersion = fs.readFileSync(swFile, 'utf8');
  await page.evaluate(() => {
    (window as unknown as { loadedOnce: boolean }).loadedOnce = true;
  });
  // What the app does every half hour and the browser on each page load: ask for the service worker again.
  await page.evaluate(async () => {
    await (await navigator.serviceWorker.getRegistration())?.update();
  });

  await visible(page, 'update-banner').waitFor({ timeout: 60_000 });
  await screenshot(page, 'update-banner-phone');
  expect(await visible(page, 'update-banner').textContent()).toContain('A new version is ready.');
  // Still the same page: nothing reloaded by itself, and the new version waits.
  expect(await page.evaluate(() => (window as unknown as { loadedOnce?: boolean }).loadedOnce)).toBe(true);
  expect(
    await page.evaluate(async () => Boolean((await navigator.serviceWorker.getRegistration())?.waiting)),
  ).toBe(true);

  await visible(page, 'update-reload').click();
  await page.waitForFunction(
    () => (window as unknown as { loadedOnce?: boolean }).loadedOnce === undefined,
    undefined,
    { timeout: 60_000 },
  );
  await visible(page, 'sign-in-email').waitFor();
  // The new version took over: nothing waits any more, and the server still has that version to give.
  expect(
    await page.evaluate(async () => Boolean((await navigator.serviceWorker.getRegistration())?.waiting)),
  ).toBe(false);
  expect(await page.evaluate(() => fetch('/sw.js', { cache: 'no-store' }).then((r) => r.text()))).toBe(
    newVersion,
  );
  expect(await page.getByTestId('update-banner').count()).toBe(0);
  await context.close();
});
