// The web app under its Content-Security-Policy (sync-server/src/middleware/content-security-policy.ts) in Debian's
// Chromium: each demo role walks its main screens and the browser reports no violation. The operator's walk uses
// every part the policy has to allow: the service worker (which the app registers itself), expo-sqlite's wasm
// in its OPFS worker, the microphone through the audio-worklet tap, the analysis worker, and
// playback from a blob: URL; the practitioner plays a review clip (blob:) over its trace.
// OWASP ASVS 4.0.3 V14.4.3 (a CSP is in place), V14.4.7 (frame-ancestors).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Page, Response } from 'playwright-core';
import { encodeWav16 } from '@/shared/analysis/wav';
import { browserForThisFile, newPage, PHONE, WIDE } from '@/tests/support/browser';
import {
  addClientAndStartSession,
  signIn,
  signInOperatorOnline,
  uniqueLetters,
  visible,
} from './helpers/operator';

jest.setTimeout(300_000);

/**
 * What the fake microphone plays: 12 s of short low-frequency bursts in pairs at 72 per minute, at 48 kHz (the
 * rate Chromium's fake capture wants). Only the recording path is under test here, not the analysis.
 */
function syntheticMicrophoneFile(): string {
  const rate = 48_000;
  const samples = new Float32Array(rate * 12);
  const beat = (60 / 72) * rate;
  for (let start = 0; start < samples.length; start += beat) {
    for (const [offset, hz] of [
      [0, 60],
      [0.3 * rate, 90],
    ] as const) {
      for (let i = 0; i < 0.08 * rate; i++) {
        const at = Math.round(start + offset + i);
        if (at >= samples.length) break;
        samples[at] = 0.6 * Math.sin((2 * Math.PI * hz * i) / rate) * Math.exp(-i / (0.02 * rate));
      }
    }
  }
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-csp-')), 'microphone.wav');
  fs.writeFileSync(file, encodeWav16(samples, rate));
  return file;
}

const browser = browserForThisFile({ fakeMicrophoneWav: syntheticMicrophoneFile() });

/**
 * Collects every CSP violation the page reports: Chromium's console lines ("Refused to …", "… Content Security
 * Policy …", also for the page's workers) and the document's `securitypolicyviolation` events (CSP Level 3 § 5.3).
 */
async function watchViolations(page: Page): Promise<string[]> {
  const violations: string[] = [];
  page.on('console', (message) => {
    const text = message.text();
    if (/Content Security Policy|Refused to/i.test(text)) violations.push(`console: ${text}`);
  });
  await page.exposeFunction('reportCspViolation', (line: string) => violations.push(`event: ${line}`));
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => {
      const report = (window as unknown as { reportCspViolation: (line: string) => void }).reportCspViolation;
      report(
        `${event.effectiveDirective} refused ${event.blockedURI || 'inline'} (${event.sourceFile}:${event.lineNumber}:${event.columnNumber})`,
      );
    });
  });
  return violations;
}

function expectPolicyHeader(response: Response | null): void {
  expect(response).not.toBeNull();
  const policy = response!.headers()['content-security-policy'];
  expect(policy).toMatch(/(^|;)\s*default-src 'self'/);
  expect(policy).toMatch(/(^|;)\s*object-src 'none'/);
  expect(policy).toMatch(/(^|;)\s*frame-ancestors 'none'/);
  expect(policy).not.toMatch(/'unsafe-eval'/);
}

/** Waits until the browser has had the chance to report what the last screen loaded. */
async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0))));
}

/** Opens the app at `size`, runs `steps` and expects no violation of the policy on the way. */
async function expectNoViolations(size: typeof PHONE, steps: (page: Page) => Promise<void>): Promise<void> {
  const { context, page } = await newPage(browser(), size);
  try {
    const violations = await watchViolations(page);
    expectPolicyHeader(await page.goto('/'));
    await steps(page);
    await settle(page);
    expect(violations).toEqual([]);
  } finally {
    await context.close();
  }
}

test('when a script is injected into the page, then the policy refuses it and the watch reports it', async () => {
  const { context, page } = await newPage(browser(), PHONE);
  try {
    const violations = await watchViolations(page);
    expectPolicyHeader(await page.goto('/'));
    await visible(page, 'sign-in-email').waitFor();
    await settle(page);
    expect(violations).toEqual([]);

    const ran = await page.evaluate(() => {
      const flag = window as unknown as { injectedRan?: boolean };
      const script = document.createElement('script');
      script.textContent = 'window.injectedRan = true;';
      document.head.append(script);
      return flag.injectedRan === true;
    });
    await settle(page);
    expect(ran).toBe(false);
    expect(violations.some((line) => line.startsWith('event: script-src-elem refused inline'))).toBe(true);
  } finally {
    await context.close();
  }
});

test('when the operator signs in, starts a session, records a site and plays the take, then nothing breaks the policy', async () => {
  await expectNoViolations(PHONE, async (page) => {
    // The service worker is registered by index.html's inline script: this waits for it to control the page.
    await signInOperatorOnline(page);
    // Adding a client writes to expo-sqlite (wasm in its OPFS worker).
    await addClientAndStartSession(page, {
      firstName: uniqueLetters(),
      lastName: 'Policy',
      dateOfBirth: '1979-05-14',
    });
    await visible(page, 'site-step-mitral').waitFor();
    await visible(page, 'length-10').click();
    await visible(page, 'record').click();
    // The level meter moves only with samples from the audio-worklet tap; the trace comes from the worker.
    await visible(page, 'level-meter').waitFor();
    await visible(page, 'take-result').waitFor({ timeout: 60_000 });
    await visible(page, 'trace').waitFor();
    await visible(page, 'play-take').click();
    await settle(page);
    // Served by the service worker now, with the headers it stored.
    expectPolicyHeader(await page.reload());
    await visible(page, 'site-step-mitral').waitFor();
  });
});

test('when the practitioner opens a session and plays a clip, then nothing breaks the policy', async () => {
  await expectNoViolations(WIDE, async (page) => {
    await signIn(page, 'practitioner@demo.fourpoint.test');
    await page.waitForURL((url) => url.pathname === '/sessions');
    await visible(page, 'sessions-table').waitFor();
    await page.locator('[data-testid^="open-session-"]').filter({ visible: true }).first().click();
    await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
    await visible(page, 'site-mitral-trace').waitFor();
    await page.locator('[data-testid="site-mitral-trace-S1"]').first().waitFor({ state: 'attached' });
    // The clip is fetched with the bearer token and played from a blob: URL; the cursor moves while it plays.
    await visible(page, 'site-mitral-play').click();
    await page
      .getByTestId('site-mitral-trace-cursor')
      .first()
      .waitFor({ state: 'attached', timeout: 15_000 });
    await visible(page, 'site-mitral-play').click();
  });
});

test('when the admin opens the overview, then nothing breaks the policy', async () => {
  await expectNoViolations(WIDE, async (page) => {
    await signIn(page, 'admin@demo.fourpoint.test');
    await page.waitForURL((url) => url.pathname === '/admin');
    await visible(page, 'admin-overview').waitFor();
    await visible(page, 'attention').waitFor();
    await visible(page, 'team-list').waitFor();
  });
});
