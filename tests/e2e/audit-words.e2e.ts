// The audit log as an admin reads it, in Chromium against the running server: a failed sign-in to a team member's
// account appears as a sentence with their name (no stored kind, no password), the stored record waits behind
// Details, and a destructive action (dropping every clinic range) asks before it acts. Phone and desktop sizes.
import type { Browser, Page } from 'playwright-core';
import { baseUrl, launchBrowser, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { demoPassword, operatorEmail, visible } from './helpers/operator';

jest.setTimeout(180_000);

const admin = 'admin@demo.fourpoint.test';
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function signInAdmin(page: Page): Promise<void> {
  await page.goto('/');
  await visible(page, 'sign-in-email').fill(admin);
  await visible(page, 'sign-in-password').fill(demoPassword);
  await visible(page, 'sign-in-submit').click();
  await page.waitForURL((url) => url.pathname === '/admin');
}

async function operatorName(): Promise<string> {
  const signIn = await fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: admin, password: demoPassword }),
  });
  const { accessToken } = (await signIn.json()) as { accessToken: string };
  const team = await fetch(`${baseUrl()}/api/team`, { headers: { authorization: `Bearer ${accessToken}` } });
  const { users } = (await team.json()) as { users: { email: string; name: string }[] };
  return users.find((u) => u.email === operatorEmail)!.name;
}

test('when someone signs in to a team member’s account with a wrong password, then the admin reads it in words, with the record behind Details', async () => {
  const wrong = `wrong-${Date.now().toString(36)}`;
  const failed = await fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: operatorEmail, password: wrong }),
  });
  expect(failed.status).toBe(401);
  const name = await operatorName();
  const sentence = `Someone tried to sign in to ${name}’s account with a wrong password`;

  for (const [size, viewport] of [
    ['wide', WIDE],
    ['phone', PHONE],
  ] as const) {
    const { context, page } = await newPage(browser, viewport);
    try {
      await signInAdmin(page);
      await page.goto('/audit');
      await visible(page, 'audit-screen').waitFor();
      await visible(page, 'audit-action-auth').click();
      await page.waitForFunction(
        (text) => document.querySelector('[data-testid="audit-table"]')?.textContent?.includes(text),
        sentence,
      );
      const shown = (await visible(page, 'audit-screen').innerText()) ?? '';
      // No stored kinds, no field names, no ids on the primary view; never the password tried.
      expect(shown).not.toMatch(/auth\.sign_in|amountCents|[0-9a-f]{8}-[0-9a-f]{4}/);
      expect(shown).not.toContain(wrong);
      await screenshot(page, `audit-failed-sign-in-${size}`);

      const row = page.locator('[data-testid^="audit-row-"]').filter({ hasText: sentence }).first();
      await row.locator('[data-testid^="audit-details-"]').click();
      const record = row.locator('[data-testid^="audit-record-"]');
      expect(await record.innerText()).toContain('auth.sign_in_failed');
      expect(await record.innerText()).not.toContain(wrong);
      await screenshot(page, `audit-record-${size}`);
    } finally {
      await context.close();
    }
  }
});

test('when the admin drops every clinic range, then it asks first, and No leaves the ranges as they were', async () => {
  const { context, page } = await newPage(browser, PHONE);
  try {
    await signInAdmin(page);
    await page.goto('/settings');
    await visible(page, 'ranges-reset-all').click();
    const yes = visible(page, 'ranges-reset-all-confirm-yes');
    await yes.waitFor();
    // The destructive step is the red button, and only after the question.
    expect(await page.getByText('Drop every range the clinic set, at every site?').count()).toBe(1);
    await screenshot(page, 'settings-reset-all-confirm-phone');
    await visible(page, 'ranges-reset-all-confirm-no').click();
    await visible(page, 'ranges-reset-all').waitFor();
    expect(await page.getByTestId('ranges-reset-all-confirm-yes').count()).toBe(0);
  } finally {
    await context.close();
  }
});
