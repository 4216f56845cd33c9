// Debian's Chromium driven by playwright-core. The flags keep it off the (closed) network and out of
// first-run flows; the fake-media flags let capture tests feed a WAV file as the microphone. Playwright
// gives each launch a fresh temporary profile itself.
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const PHONE = { width: 390, height: 844 };
export const WIDE = { width: 1440, height: 900 };
export const screenshotDir = path.resolve(__dirname, '../../artifacts/screenshots');

export function baseUrl(): string {
  const url = process.env.E2E_BASE_URL;
  if (!url)
    throw new Error(
      'E2E_BASE_URL is not set: run the e2e project through jest (its global setup starts the server).',
    );
  return url;
}

export async function launchBrowser(options: { fakeMicrophoneWav?: string } = {}): Promise<Browser> {
  const args = [
    '--headless',
    '--no-sandbox',
    '--disable-gpu',
    '--disable-quic',
    '--no-first-run',
    '--disable-background-networking',
    '--disable-component-update',
    '--disable-sync',
  ];
  if (options.fakeMicrophoneWav) {
    args.push(
      '--use-fake-ui-for-media-stream',
      '--use-fake-device-for-media-stream',
      `--use-file-for-fake-audio-capture=${options.fakeMicrophoneWav}`,
    );
  }
  return chromium.launch({ executablePath: '/usr/bin/chromium', args });
}

/** One browser for all the tests of a file: launched before the first, closed after the last. */
export function browserForThisFile(options: { fakeMicrophoneWav?: string } = {}): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser(options);
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('The browser is launched in beforeAll; use it inside a test.');
    return browser;
  };
}

/** Pages still open, so a failing test can show what each screen looked like (tests/support/e2e-failure-report.ts). */
export const openPages = new Set<Page>();

/** Follows a page the test opened itself (a second tab) in the failure report. */
export function trackPage(page: Page): Page {
  openPages.add(page);
  page.once('close', () => openPages.delete(page));
  return page;
}

/**
 * One page per context: expo-sqlite's OPFS database is exclusive to one tab. The browser reads as a British
 * English reader (the app writes dates in the reader's locale), so tests that read dates see one written form.
 */
export async function newPage(
  browser: Browser,
  viewport: { width: number; height: number },
): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport, baseURL: baseUrl(), locale: 'en-GB' });
  const page = trackPage(await context.newPage());
  return { context, page };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: false });
  return file;
}
