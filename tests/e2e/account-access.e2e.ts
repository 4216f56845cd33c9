// Getting into an account without a dead end, at phone size: a used invitation says so and leads to sign-in, and a
// forgotten password is reset through the e-mailed link (read in the admin's Mailbox, where it is a real link).
// Each test makes its own account through an invitation, so the demo users' passwords stay as they are.
import type { Page } from 'playwright-core';
import { baseUrl, browserForThisFile, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { demoPassword } from './helpers/operator';

jest.setTimeout(240_000);

const browser = browserForThisFile();
const run = Date.now().toString(36);
const admin = 'admin@demo.fourpoint.test';

const visible = (page: Page, testId: string) => page.getByTestId(testId).filter({ visible: true }).first();

async function api<T>(path: string, init: { method?: string; body?: unknown; token?: string } = {}) {
  const response = await fetch(`${baseUrl()}${path}`, {
    method: init.method ?? 'GET',
    headers: {
      'content-type': 'application/json',
      ...(init.token ? { authorization: `Bearer ${init.token}` } : {}),
    },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  });
  return { status: response.status, body: (await response.json()) as T };
}

async function adminToken(): Promise<string> {
  const { status, body } = await api<{ accessToken: string }>('/api/auth/sign-in', {
    method: 'POST',
    body: { email: admin, password: demoPassword },
  });
  expect(status).toBe(200);
  return body.accessToken;
}

/** The newest message to an address in the admin's Mailbox (the view of the local SMTP fake). */
async function newestMailTo(to: string, subject: RegExp): Promise<{ id: string; text: string }> {
  const token = await adminToken();
  for (;;) {
    const { body } = await api<{
      messages: { id: string; subject: string; to?: string; envelopeTo?: string[] }[];
    }>(`/api/admin/mailbox/messages?to=${encodeURIComponent(to)}`, { token });
    const mine = body.messages.find(
      (m) => subject.test(m.subject) && (m.envelopeTo ?? [m.to ?? '']).some((t) => t.includes(to)),
    );
    if (mine) {
      const { body: message } = await api<{ text: string }>(`/api/admin/mailbox/messages/${mine.id}`, {
        token,
      });
      return { id: mine.id, text: message.text };
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/** A new practitioner account, made through an invitation; answers the invitation link and the password. */
async function newAccount(
  label: string,
): Promise<{ email: string; password: string; invitationLink: string }> {
  const email = `${label}-${run}@demo.fourpoint.test`;
  const password = `first ${label} ${run} password`;
  const invited = await api('/api/team/invitations', {
    method: 'POST',
    token: await adminToken(),
    body: { email, name: 'Linnea Saltmarsh', role: 'practitioner' },
  });
  expect(invited.status).toBe(201);
  const mail = await newestMailTo(email, /invited/);
  const invitationLink = /https?:\/\/\S+\/invite\/[A-Za-z0-9_~-]+/.exec(mail.text)![0];
  const token = invitationLink.split('/invite/')[1];
  const accepted = await api(`/api/invitations/${token}/accept`, {
    method: 'POST',
    body: { email, name: 'Linnea Saltmarsh', password },
  });
  expect(accepted.status).toBe(201);
  return { email, password, invitationLink };
}

test('when a used invitation link is opened, then it says it was used and leads to sign-in', async () => {
  const account = await newAccount('reused');
  const { context, page } = await newPage(browser(), PHONE);
  try {
    await page.goto(new URL(account.invitationLink).pathname);
    expect(await visible(page, 'invite-invalid').textContent()).toMatch(/already been used/);
    expect(await page.getByText('Try again').count()).toBe(0);
    await screenshot(page, 'invitation-used-phone');
    await visible(page, 'invite-invalid-sign-in').click();
    await page.waitForURL((url) => url.pathname === '/sign-in');
    await visible(page, 'sign-in-email').waitFor();
  } finally {
    await context.close();
  }
});

test('when a person forgets their password, then the e-mailed link sets a new one once and the old one stops working', async () => {
  const account = await newAccount('forgot');
  const { context, page } = await newPage(browser(), PHONE);
  try {
    await page.goto('/sign-in');
    await visible(page, 'sign-in-forgot').click();
    await visible(page, 'forgot-password-screen').waitFor();
    await visible(page, 'forgot-password-email').fill(account.email);
    await visible(page, 'forgot-password-submit').click();
    expect(await visible(page, 'forgot-password-sent').textContent()).toMatch(
      /If an account uses this address/,
    );
    await screenshot(page, 'password-forgot-sent-phone');

    // The admin's Mailbox shows the e-mail with its link as a link.
    const mail = await newestMailTo(account.email, /new Fourpoint password/);
    const adminSide = await newPage(browser(), WIDE);
    let href: string | null;
    try {
      await adminSide.page.goto('/');
      await visible(adminSide.page, 'sign-in-email').fill(admin);
      await visible(adminSide.page, 'sign-in-password').fill(demoPassword);
      await visible(adminSide.page, 'sign-in-submit').click();
      await adminSide.page.waitForURL((url) => url.pathname === '/admin');
      await visible(adminSide.page, 'nav-mailbox').click();
      await visible(adminSide.page, `mailbox-message-${mail.id}`).click();
      const anchor = visible(adminSide.page, 'mailbox-body').locator('a');
      href = await anchor.getAttribute('href');
      expect(href).toMatch(/\/reset-password\/[A-Za-z0-9_~-]+$/);
      expect(mail.text).toContain(href!);
      await screenshot(adminSide.page, 'mailbox-reset-link-wide');
    } finally {
      await adminSide.context.close();
    }

    await page.goto(new URL(href!).pathname);
    await visible(page, 'reset-password').fill('short');
    await visible(page, 'reset-submit').click();
    expect(await visible(page, 'reset-password-error').textContent()).toMatch(/at least 12 characters/);
    const chosen = `lantern meadow ${run} sleeve`;
    await visible(page, 'reset-password').fill(chosen);
    await visible(page, 'reset-submit').click();
    await visible(page, 'reset-done').waitFor();
    await screenshot(page, 'password-reset-done-phone');

    // Used once: the same link now says so and offers sign-in.
    await page.goto(new URL(href!).pathname);
    expect(await visible(page, 'reset-invalid').textContent()).toMatch(/already been used/);
    await visible(page, 'reset-to-sign-in').click();
    await page.waitForURL((url) => url.pathname === '/sign-in');

    const old = await api('/api/auth/sign-in', {
      method: 'POST',
      body: { email: account.email, password: account.password },
    });
    expect(old.status).toBe(401);
    await visible(page, 'sign-in-email').fill(account.email);
    await visible(page, 'sign-in-password').fill(chosen);
    await visible(page, 'sign-in-submit').click();
    await page.waitForURL((url) => url.pathname === '/sessions');
  } finally {
    await context.close();
  }
});
