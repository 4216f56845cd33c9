// Steps of the operator's phone flow shared by the end-to-end tests (sign in, add a client with consent, take or
// import a site, keep it). Test ids are the app's own (features/clients, features/capture).
import fs from 'node:fs';
import type { Page } from 'playwright-core';

/** Made per run by tests/support/e2e-global-setup.ts, which loads the demo clinic with it. */
export const demoPassword = process.env.FOURPOINT_DEMO_PASSWORD ?? '';
if (!demoPassword) throw new Error('FOURPOINT_DEMO_PASSWORD is not set: run the e2e tests through jest.');
export const operatorEmail = 'operator@demo.fourpoint.test';
export const practitionerEmail = 'practitioner@demo.fourpoint.test';

export function visible(page: Page, testId: string) {
  return page.getByTestId(testId).filter({ visible: true }).first();
}

/** Letters only (names are validated as names), different on every run. */
export function uniqueLetters(length = 6): string {
  let n = Date.now() * 1000 + Math.floor(Math.random() * 1000);
  let out = '';
  for (let i = 0; i < length; i++) {
    out += String.fromCharCode(97 + (n % 26));
    n = Math.floor(n / 26);
  }
  return out;
}

export async function signIn(page: Page, email: string): Promise<void> {
  await page.goto('/');
  await visible(page, 'sign-in-email').waitFor();
  await visible(page, 'sign-in-email').fill(email);
  await visible(page, 'sign-in-password').fill(demoPassword);
  await visible(page, 'sign-in-submit').click();
}

/** Signs the operator in while online and waits for what offline work needs: the service worker and the key. */
export async function signInOperatorOnline(page: Page): Promise<void> {
  await signIn(page, operatorEmail);
  await page.waitForURL((url) => url.pathname === '/clients');
  await visible(page, 'operator-home').waitFor();
  await page.waitForFunction(() => navigator.serviceWorker.ready.then(() => true), undefined, {
    timeout: 60_000,
  });
  await page.goto('/outbox');
  await visible(page, 'outbox-screen').waitFor();
  await page.waitForFunction(
    () => Boolean(localStorage.getItem('fourpoint.clinic-public-key.v1')),
    undefined,
    { timeout: 30_000 },
  );
  await page.waitForFunction(() => Boolean(navigator.serviceWorker.controller), undefined, {
    timeout: 30_000,
  });
}

/** Adds a client, records consent in their name, and starts a session; returns the capture page's path. */
export async function addClientAndStartSession(
  page: Page,
  client: { firstName: string; lastName: string; dateOfBirth: string },
): Promise<string> {
  await page.goto('/clients/new');
  await visible(page, 'client-form').waitFor();
  await visible(page, 'client-firstName').fill(client.firstName);
  await visible(page, 'client-lastName').fill(client.lastName);
  await visible(page, 'client-dateOfBirth').fill(client.dateOfBirth);
  await visible(page, 'client-submit').click();
  await visible(page, 'client-detail').waitFor();
  await visible(page, 'consent-name').fill(`${client.firstName} ${client.lastName}`);
  await visible(page, 'consent-submit').click();
  await visible(page, 'consent-on-file').waitFor();
  await visible(page, 'start-session').click();
  await page.waitForURL((url) => url.pathname.startsWith('/capture/'));
  return new URL(page.url()).pathname;
}

export async function keepTake(page: Page): Promise<void> {
  if ((await page.getByTestId('verdict-retake').filter({ visible: true }).count()) > 0) {
    await visible(page, 'keep-note').fill('End-to-end run: kept to test the flow.');
    await visible(page, 'keep-anyway').click();
  } else {
    await visible(page, 'keep-take').click();
  }
}

/** Imports a WAV file for the current site and keeps it; returns the rate the device measured. */
export async function importSite(page: Page, site: string, file: string): Promise<number> {
  if (!fs.existsSync(file)) throw new Error(`Missing test recording ${file}.`);
  await visible(page, `site-step-${site}`).waitFor();
  const chooser = page.waitForEvent('filechooser');
  await visible(page, 'import').click();
  await (await chooser).setFiles(file);
  await visible(page, 'take-result').waitFor({ timeout: 30_000 });
  const rate = Number((await visible(page, 'heart-rate').textContent())?.replace(/[^0-9.]/g, ''));
  await keepTake(page);
  return rate;
}
