// The operator's phone in a room without network: the clinic's clients are on the phone after sign-in, offline is
// a quiet state rather than an error, a client added on the phone reaches the clinic without a session, and an
// erased client leaves the phone. Expected behaviour is the product's own rule (DESIGN.md, "The capture flow" and
// "Sync"; issue 12); no outside source.
import type { Page } from 'playwright-core';
import { baseUrl, browserForThisFile, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { clientWithConsentAtTheClinic, tokenFor } from './helpers/api';
import { operatorEmail, signInOperatorOnline, uniqueLetters, visible } from './helpers/operator';

jest.setTimeout(240_000);

const browser = browserForThisFile();
const adminEmail = 'admin@demo.fourpoint.test';

async function api(token: string, method: string, path: string, body?: unknown) {
  const response = await fetch(`${baseUrl()}${path}`, {
    method,
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: response.status, json: (await response.json().catch(() => null)) as unknown };
}

/** A client another phone added, with consent to the wording in force, already at the clinic. */
async function clientAtTheClinic(lastName: string): Promise<string> {
  const { clientId, results } = await clientWithConsentAtTheClinic('Solveig', lastName);
  expect(results.map((r) => r.status)).toEqual(['applied', 'applied']);
  return clientId;
}

function clientRow(page: Page, lastName: string) {
  return page.locator('[data-testid^="client-row-"]').filter({ visible: true, hasText: lastName }).first();
}

async function findOnPhone(page: Page, lastName: string) {
  await visible(page, 'client-search').fill(lastName);
  const row = clientRow(page, lastName);
  await row.waitFor({ timeout: 30_000 });
  return row;
}

test('when the phone goes offline, then a client never opened on it is listed and opened with the consent the clinic holds, with a quiet Offline mark and no error', async () => {
  const lastName = `Hallvard${uniqueLetters()}`;
  await clientAtTheClinic(lastName);
  const { context, page } = await newPage(browser(), PHONE);
  await signInOperatorOnline(page);
  await page.goto('/clients');
  const row = await findOnPhone(page, lastName);
  expect(await row.innerText()).toContain('Consent on file');

  await context.setOffline(true);
  await page.reload();
  await visible(page, 'offline-mark').waitFor();
  const offlineRow = await findOnPhone(page, lastName);
  expect(await offlineRow.innerText()).toContain('Consent on file');
  expect(await page.getByTestId('clients-error').count()).toBe(0);
  expect(await page.locator('body').innerText()).not.toMatch(/Could not load|Network/i);
  await screenshot(page, 'phone-offline-clients');
  await offlineRow.click();
  await visible(page, 'client-detail').waitFor();
  expect(await visible(page, 'consent-on-file').innerText()).toContain(`Signed by Solveig ${lastName}`);
  expect(await page.getByTestId('consent-form').filter({ visible: true }).count()).toBe(0);
  await screenshot(page, 'phone-offline-client-page');

  // The network returns: the mark goes by itself, nothing to press.
  await context.setOffline(false);
  await page.getByTestId('offline-mark').filter({ visible: true }).waitFor({ state: 'detached' });
  await context.close();
});

test('when a new consent wording is published, then the list and the client page agree that consent is needed', async () => {
  const lastName = `Brekkestad${uniqueLetters()}`;
  await clientAtTheClinic(lastName);
  const adminToken = await tokenFor(adminEmail);
  const published = await api(adminToken, 'POST', '/api/consent-texts', {
    title: 'Consent to heart-sound recording',
    body: `I agree that the clinic records the sounds of my heart at four places on my chest (${uniqueLetters()}).`,
  });
  expect(published.status).toBeLessThan(300);

  const { context, page } = await newPage(browser(), PHONE);
  await signInOperatorOnline(page);
  await page.goto('/clients');
  const row = await findOnPhone(page, lastName);
  await page.waitForFunction(
    (name) =>
      Array.from(document.querySelectorAll('[data-testid^="client-row-"]')).some(
        (el) => el.textContent?.includes(name) && el.textContent.includes('Needs consent'),
      ),
    lastName,
    { timeout: 20_000 },
  );
  await row.click();
  await visible(page, 'consent-needed').waitFor();
  await context.close();
});

test('when a client is added on the phone without a session, then they reach the clinic with the next sync and the badge clears; Back from capture returns to them', async () => {
  const lastName = `Ostervold${uniqueLetters()}`;
  const { context, page } = await newPage(browser(), PHONE);
  await signInOperatorOnline(page);
  await context.setOffline(true);
  await page.goto('/clients/new');
  await visible(page, 'client-firstName').fill('Tamsin');
  await visible(page, 'client-lastName').fill(lastName);
  await visible(page, 'client-submit').click();
  await visible(page, 'client-detail').waitFor();
  await page.goto('/clients');
  const row = await findOnPhone(page, lastName);
  expect(await row.innerText()).toContain('Not yet synced');

  await page.goto('/outbox');
  const group = page
    .locator('[data-testid="outbox-group-new-client"]')
    .filter({ visible: true, hasText: lastName });
  await group.waitFor();
  expect(await group.innerText()).toContain('Client details waiting to send');
  await screenshot(page, 'phone-outbox-new-client-offline');
  await page.setViewportSize(WIDE);
  await screenshot(page, 'phone-outbox-new-client-offline-wide');
  await page.setViewportSize(PHONE);

  await context.setOffline(false);
  const operatorToken = await tokenFor(operatorEmail);
  for (let i = 0; ; i++) {
    const found = await api(operatorToken, 'GET', `/api/clients?q=${encodeURIComponent(lastName)}`);
    if ((found.json as { clients: { lastName: string }[] }).clients.some((c) => c.lastName === lastName))
      break;
    if (i > 60) throw new Error('The client added on the phone never reached the clinic.');
    await page.waitForTimeout(500);
  }
  await page.goto('/clients');
  await findOnPhone(page, lastName);
  await page.waitForFunction(
    (name) =>
      Array.from(document.querySelectorAll('[data-testid^="client-row-"]')).some(
        (el) => el.textContent?.includes(name) && !el.textContent.includes('Not yet synced'),
      ),
    lastName,
    { timeout: 20_000 },
  );

  await clientRow(page, lastName).click();
  await visible(page, 'client-detail').waitFor();
  const clientPath = new URL(page.url()).pathname;
  await visible(page, 'consent-name').fill(`Tamsin ${lastName}`);
  expect(await visible(page, 'consent-date').innerText()).toMatch(/^Today, /);
  await visible(page, 'consent-submit').click();
  await visible(page, 'start-session').click();
  await page.waitForURL((url) => url.pathname.startsWith('/capture/'));
  await page.goBack();
  await page.waitForURL((url) => url.pathname === clientPath);
  await visible(page, 'resume-session').waitFor();
  await context.close();
});

test('when the clinic erases a client the phone added, then the client and every mention of their name leave the phone, outbox included', async () => {
  const lastName = `Vindeby${uniqueLetters()}`;
  const { context, page } = await newPage(browser(), PHONE);
  await signInOperatorOnline(page);
  await page.goto('/clients/new');
  await visible(page, 'client-firstName').fill('Aurelie');
  await visible(page, 'client-lastName').fill(lastName);
  await visible(page, 'client-submit').click();
  await visible(page, 'client-detail').waitFor();
  const clientId = new URL(page.url()).pathname.split('/').pop()!;
  await page.goto('/outbox');
  const group = page
    .locator('[data-testid="outbox-group-name"]')
    .filter({ visible: true, hasText: lastName });
  await group.waitFor();
  await page.waitForFunction(
    () => document.querySelector('[data-testid="outbox-summary"]')?.textContent === 'ALL SENT',
    undefined,
    { timeout: 30_000 },
  );

  const adminToken = await tokenFor(adminEmail);
  const erased = await api(adminToken, 'POST', `/api/client-records/${clientId}/erase`, {
    confirmName: `Aurelie ${lastName}`,
  });
  expect(erased.status).toBe(200);

  await visible(page, 'sync-now').click();
  await group.waitFor({ state: 'detached', timeout: 30_000 });
  expect(await page.locator('body').innerText()).not.toContain(lastName);
  await page.goto('/clients');
  await visible(page, 'client-search').fill(lastName);
  await visible(page, 'clients-empty').waitFor();
  await page.goto(`/clients/${clientId}`);
  await visible(page, 'client-missing').waitFor();
  await context.close();
});
