// The practice's side at 1440x900 in Chromium against the running server and its local fakes: an invitation
// read from the fake mailbox and accepted, a package paid on the fake provider's hosted page, a client's data
// exported as a zip and the client erased. Each test makes its own clients (invented names with a run suffix),
// so the demo clients the other e2e files use stay untouched. One page per browser context.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { unzipSync } from 'fflate';
import type { Browser, Page } from 'playwright-core';
import { baseUrl, launchBrowser, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { demoPassword } from './helpers/operator';

jest.setTimeout(240_000);

const password = demoPassword;
const admin = 'admin@demo.fourpoint.test';
const run = Date.now().toString(36);
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const visible = (page: Page, testId: string) => page.getByTestId(testId).filter({ visible: true }).first();

async function signIn(page: Page, email: string, secret = password): Promise<void> {
  await page.goto('/');
  await visible(page, 'sign-in-email').waitFor();
  await visible(page, 'sign-in-email').fill(email);
  await visible(page, 'sign-in-password').fill(secret);
  await visible(page, 'sign-in-submit').click();
}

async function signInAdmin(page: Page): Promise<void> {
  await signIn(page, admin);
  await page.waitForURL((url) => url.pathname === '/admin');
  await visible(page, 'admin-home').waitFor();
}

async function openTab(page: Page, name: string, screen: string): Promise<void> {
  await visible(page, `nav-${name}`).click();
  await visible(page, screen).waitFor();
}

async function adminToken(): Promise<string> {
  const response = await fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: admin, password }),
  });
  expect(response.status).toBe(200);
  return ((await response.json()) as { accessToken: string }).accessToken;
}

type NewClient = { id: string; firstName: string; lastName: string; email: string; notes: string };

async function createClient(firstName: string, lastName: string): Promise<NewClient> {
  const email = `${firstName}.${lastName}@example.test`.toLowerCase();
  const notes = `Prefers morning visits; marker ${lastName}`;
  const response = await fetch(`${baseUrl()}/api/client-records`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${await adminToken()}` },
    body: JSON.stringify({ firstName, lastName, email, dateOfBirth: '1987-06-14', phone: '555 0142', notes }),
  });
  expect(response.status).toBe(201);
  const { id } = (await response.json()) as { id: string };
  return { id, firstName, lastName, email, notes };
}

// The fake mailbox's own HTTP API when the set-up passes its port to the tests; otherwise the server's admin
// proxy of the same mailbox (the e2e set-up keeps the fakes' ports in the server's environment only).
async function mailboxGet<T>(pathAndQuery: string): Promise<T> {
  const port = process.env.MAIL_FAKE_HTTP_PORT;
  const response = port
    ? await fetch(`http://127.0.0.1:${port}/api/messages${pathAndQuery}`)
    : await fetch(`${baseUrl()}/api/admin/mailbox/messages${pathAndQuery}`, {
        headers: { authorization: `Bearer ${await adminToken()}` },
      });
  expect(response.status).toBe(200);
  return (await response.json()) as T;
}

async function waitForMail(to: string): Promise<{ subject: string; text: string }> {
  const deadline = Date.now() + 20_000;
  while (Date.now() < deadline) {
    const list = await mailboxGet<{ messages: { id: string; to?: string; envelopeTo?: string[] }[] }>(
      `?to=${encodeURIComponent(to)}`,
    );
    const mine = list.messages.find((m) => (m.envelopeTo ?? [m.to ?? '']).some((t) => t.includes(to)));
    if (mine) return mailboxGet<{ subject: string; text: string }>(`/${mine.id}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`No e-mail to ${to} reached the fake mailbox within 20 s.`);
}

test('when the admin invites a practitioner, then the e-mailed link lets them set a password and sign in', async () => {
  const email = `practitioner-${run}@demo.fourpoint.test`;
  const chosen = `heart-${run}-Sounds!`;
  const adminSide = await newPage(browser, WIDE);
  try {
    const page = adminSide.page;
    await signInAdmin(page);
    await screenshot(page, 'practice-admin-home-wide');
    await openTab(page, 'team', 'team-screen');
    await visible(page, 'invite-send').click();
    await visible(page, 'invite-email-error').waitFor();
    await visible(page, 'invite-name').fill('Juniper Okonkwo-Vale');
    await visible(page, 'invite-email').fill(email);
    await visible(page, 'invite-role-practitioner').click();
    await visible(page, 'invite-send').click();
    expect(await visible(page, 'invite-sent').textContent()).toContain(email);
    await screenshot(page, 'practice-team');
  } finally {
    await adminSide.context.close();
  }

  const mail = await waitForMail(email);
  const link = /https?:\/\/\S+\/invite\/[A-Za-z0-9_~-]+/.exec(mail.text)?.[0];
  expect(link).toBeDefined();

  const invitee = await newPage(browser, WIDE);
  try {
    const page = invitee.page;
    await page.goto(new URL(link!).pathname);
    await visible(page, 'invite-accept-name').waitFor();
    await visible(page, 'invite-accept-password').fill('short');
    await visible(page, 'invite-accept').click();
    await visible(page, 'invite-accept-password-error').waitFor();
    await screenshot(page, 'practice-invite');
    // The invited address and name are already in the fields; accepting them as shown is enough.
    expect(await visible(page, 'invite-accept-email').inputValue()).toBe(email);
    expect(await visible(page, 'invite-accept-name').inputValue()).toBe('Juniper Okonkwo-Vale');
    await visible(page, 'invite-accept-password').fill(chosen);
    await visible(page, 'invite-accept').click();
    await page.waitForFunction(() =>
      Boolean(document.querySelector('[data-testid="invite-done"], [data-testid="invite-accept-error"]')),
    );
    expect(await page.getByTestId('invite-accept-error').allTextContents()).toEqual([]);
    await visible(page, 'invite-done').waitFor();
    await visible(page, 'invite-to-sign-in').click();
    await signIn(page, email, chosen);
    await page.waitForURL((url) => url.pathname === '/sessions');
    await visible(page, 'practitioner-home').waitFor();
    expect(await visible(page, 'signed-in-name').textContent()).toBe('Juniper Okonkwo-Vale');
  } finally {
    await invitee.context.close();
  }

  // The link works once: a second use is refused with a message, not a second account.
  const reuse = await newPage(browser, WIDE);
  try {
    await reuse.page.goto(new URL(link!).pathname);
    await visible(reuse.page, 'invite-screen').waitFor();
    await reuse.page.waitForFunction(
      () =>
        document.querySelector('[data-testid="invite-invalid"]') !== null ||
        document.querySelector('[data-testid="invite-accept-name"]') !== null,
    );
    if ((await reuse.page.getByTestId('invite-accept-name').count()) > 0) {
      await visible(reuse.page, 'invite-accept-name').fill('Someone Else');
      await visible(reuse.page, 'invite-accept-password').fill(`another-${run}-password`);
      await visible(reuse.page, 'invite-accept').click();
      await visible(reuse.page, 'invite-accept-error').waitFor();
    } else {
      expect(await visible(reuse.page, 'invite-invalid').textContent()).toMatch(/used|not valid/i);
    }
  } finally {
    await reuse.context.close();
  }
});

test('when a client pays for a package on the provider page, then billing shows it paid and the record holds the package', async () => {
  const client = await createClient('Marisol', `Tennant${run}`);
  const adminSide = await newPage(browser, WIDE);
  try {
    const page = adminSide.page;
    await signInAdmin(page);
    await openTab(page, 'billing', 'billing-screen');
    await visible(page, 'payment-create').click();
    await visible(page, 'payment-client-error').waitFor();
    await visible(page, 'payment-client-search').fill(client.lastName);
    await visible(page, `payment-client-option-${client.id}`).click();
    await visible(page, 'payment-offer-package-5').click();
    await visible(page, 'payment-create').click();
    await visible(page, 'payment-created').waitFor();
    const checkoutUrl = (await visible(page, 'payment-checkout-url').textContent())!.trim();
    expect(checkoutUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/pay\//);
    // The payment page belongs to the provider: our screen has no card field.
    expect(await page.locator('input[autocomplete="cc-number"]').count()).toBe(0);
    await screenshot(page, 'practice-billing-pending');

    const payer = await newPage(browser, WIDE);
    try {
      const pay = payer.page;
      // The payer has the app installed: its service worker controls our origin when the provider sends them back.
      await pay.goto('/');
      await visible(pay, 'sign-in-email').waitFor();
      await pay.waitForFunction(() => navigator.serviceWorker.ready.then(() => true), undefined, {
        timeout: 60_000,
      });
      await pay.reload();
      await pay.waitForFunction(() => Boolean(navigator.serviceWorker.controller), undefined, {
        timeout: 30_000,
      });
      await pay.goto(checkoutUrl);
      expect(await pay.getByTestId('pay-amount').textContent()).toBe('$250.00');
      const fill = async (card: string) => {
        await pay.fill('#card_number', card);
        await pay.fill('#exp', '12 / 34');
        await pay.fill('#cvc', '123');
        await pay.fill('#name', 'Marisol Tennant');
      };
      await fill('4000 0000 0000 0002');
      await pay.click('button[type="submit"]');
      await pay.getByRole('alert').waitFor();
      await fill('4242 4242 4242 4242');
      await screenshot(pay, 'practice-provider-page');
      const returned = pay.waitForResponse(
        (response) => new URL(response.url()).pathname === '/payments/complete',
      );
      await pay.click('button[type="submit"]');
      // The server's own page, not the cached app shell (which would show the app's "not found").
      expect((await returned).fromServiceWorker()).toBe(false);
      // Paid, or still being confirmed when the provider's webhook has not arrived yet: both are the server's.
      expect(await pay.getByTestId('payment-return-title').textContent()).toMatch(
        /^(Thank you, your payment is received|Your payment is being confirmed)$/,
      );
      await screenshot(pay, 'practice-payment-return');
    } finally {
      await payer.context.close();
    }

    await visible(page, 'payments-search').fill(client.lastName);
    await page.waitForFunction(
      (name) => {
        const rows = Array.from(document.querySelectorAll('[data-testid^="payment-row-"]'));
        return (
          rows.length === 1 && rows[0].textContent!.includes(name) && rows[0].textContent!.includes('Paid')
        );
      },
      client.lastName,
      { timeout: 30_000 },
    );
    const row = page.locator('[data-testid^="payment-row-"]').filter({ visible: true }).first();
    expect(await row.textContent()).toContain('$250.00');
    await screenshot(page, 'practice-billing-paid');

    await openTab(page, 'client-records/index', 'client-table-screen');
    await visible(page, 'client-table-search').fill(client.lastName);
    await visible(page, `client-record-row-${client.id}`).click();
    await visible(page, 'client-packages').waitFor();
    await page.waitForFunction(() =>
      document.querySelector('[data-testid="client-packages"]')?.textContent?.includes('5 left'),
    );
  } finally {
    await adminSide.context.close();
  }
});

test('when the admin exports and then erases a client, then the zip holds the CSVs, the client is gone and the audit log keeps the erasure without the data', async () => {
  const client = await createClient('Oriel', `Fairweather${run}`);
  const { context, page } = await newPage(browser, WIDE);
  try {
    await signInAdmin(page);
    await openTab(page, 'client-records/index', 'client-table-screen');
    await visible(page, 'client-table').waitFor();
    await screenshot(page, 'practice-clients');
    await visible(page, 'client-table-search').fill(client.lastName);
    await visible(page, `client-record-row-${client.id}`).click();
    await page.waitForURL((url) => url.pathname === `/client-records/${client.id}`);
    await visible(page, 'client-details').waitFor();
    await screenshot(page, 'practice-client-record');

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      visible(page, 'client-export').click(),
    ]);
    const file = path.join(
      fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-export-')),
      download.suggestedFilename(),
    );
    await download.saveAs(file);
    expect(download.suggestedFilename()).toMatch(/^fourpoint-export-.*\.zip$/);
    const entries = unzipSync(new Uint8Array(fs.readFileSync(file)));
    for (const name of ['client.csv', 'consents.csv', 'visits.csv', 'measurements.csv']) {
      expect(Object.keys(entries)).toContain(name);
    }
    expect(Buffer.from(entries['client.csv']).toString('utf8')).toContain(client.lastName);
    await visible(page, 'client-export-done').waitFor();

    await visible(page, 'erase-start').click();
    await visible(page, 'erase-confirm-name').fill(`${client.firstName} Someone`);
    await visible(page, 'erase-submit').click();
    await visible(page, 'erase-confirm-name-error').waitFor();
    await visible(page, 'erase-confirm-name').fill(`${client.firstName} ${client.lastName}`);
    await screenshot(page, 'practice-erase-confirm');
    await visible(page, 'erase-submit').click();
    await visible(page, 'erase-result').waitFor();
    // A client added at the desk and never seen: only the record goes, said in words.
    expect(await visible(page, 'erase-result-counts').textContent()).toBe(
      `Erased ${client.firstName} ${client.lastName}: the record only (no visits yet).`,
    );
    await screenshot(page, 'practice-erase-result');

    await visible(page, 'erase-result-back').click();
    await visible(page, 'client-table-search').fill(client.lastName);
    await visible(page, 'client-table-empty').waitFor();

    await openTab(page, 'audit', 'audit-screen');
    await visible(page, 'audit-action-client').click();
    // The newest client event is this erasure, in words; its stored record (with the client's id) is behind Details.
    await page.waitForFunction(() =>
      document
        .querySelector('[data-testid^="audit-row-"]')
        ?.textContent?.includes('Theo Lindqvist erased a client and their records: the record only'),
    );
    const first = page.locator('[data-testid^="audit-details-"]').filter({ visible: true }).first();
    await first.click();
    const record = page.locator('[data-testid^="audit-record-"]').filter({ visible: true }).first();
    expect(await record.innerText()).toContain(client.id);
    const auditText = (await visible(page, 'audit-table').textContent()) ?? '';
    expect(auditText).toContain('Theo Lindqvist');
    for (const erased of [client.firstName, client.lastName, client.email, client.notes]) {
      expect(auditText).not.toContain(erased);
    }
    await screenshot(page, 'practice-audit');

    await openTab(page, 'settings', 'settings-screen');
    await visible(page, 'range-editor').waitFor();
    await screenshot(page, 'practice-settings');
  } finally {
    await context.close();
  }
});

test('when the admin opens the overview on a phone, then the tabs and the cards fit at 390 px', async () => {
  const { context, page } = await newPage(browser, PHONE);
  try {
    await signInAdmin(page);
    await visible(page, 'bottom-tabs').waitFor();
    await visible(page, 'attention').waitFor();
    await screenshot(page, 'practice-admin-home-phone');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    await openTab(page, 'client-records/index', 'client-table-screen');
    await visible(page, 'client-table').waitFor();
    await screenshot(page, 'practice-clients-phone');
  } finally {
    await context.close();
  }
});
