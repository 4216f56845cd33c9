// Each demo role signs in at the phone and wide targets, sees its own home, and signs out; one page per
// browser context because expo-sqlite's OPFS database is exclusive to one tab.
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { demoPassword } from './helpers/operator';

jest.setTimeout(90_000);

const password = demoPassword;

const roles = [
  { role: 'operator', home: 'operator-home', path: '/clients', content: 'clients-list', row: 'client-row-' },
  {
    role: 'practitioner',
    home: 'practitioner-home',
    path: '/sessions',
    content: 'sessions-table',
    row: 'session-row-',
  },
  { role: 'admin', home: 'admin-home', path: '/admin', content: 'team-list', row: 'team-row-' },
] as const;

const sizes = [
  { name: 'phone', viewport: PHONE, nav: 'bottom-tabs' },
  { name: 'wide', viewport: WIDE, nav: 'side-nav' },
] as const;

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

async function signIn(page: Page, email: string, secret: string): Promise<void> {
  await page.goto('/');
  await page.getByTestId('sign-in-email').waitFor({ state: 'visible' });
  await page.getByTestId('sign-in-email').fill(email);
  await page.getByTestId('sign-in-password').fill(secret);
  await page.getByTestId('sign-in-submit').click();
}

function visible(page: Page, testId: string) {
  return page.getByTestId(testId).filter({ visible: true }).first();
}

describe.each(sizes)('at $name size', ({ name, viewport, nav }) => {
  test.each(roles)(
    'when the $role signs in, then their own home shows demo data, survives a reload, and sign-out returns to sign-in',
    async ({ role, home, path, content, row }) => {
      const { context, page } = await newPage(browser, viewport);
      try {
        await signIn(page, `${role}@demo.fourpoint.test`, password);
        await page.waitForURL((url) => url.pathname === path);
        await visible(page, home).waitFor();
        await visible(page, content).waitFor();
        expect(
          await page.locator(`[data-testid^="${row}"]`).filter({ visible: true }).count(),
        ).toBeGreaterThan(0);
        // The full caution where results are listed (the practitioner's visits), one line elsewhere.
        await page
          .locator('[data-testid="caution-note"], [data-testid="caution-line"]')
          .filter({ visible: true })
          .first()
          .waitFor();
        await visible(page, nav).waitFor();
        expect(await visible(page, 'signed-in-name').textContent()).not.toBe('');
        await screenshot(page, `${role}-${name}`);

        await page.reload();
        await visible(page, content).waitFor();
        expect(new URL(page.url()).pathname).toBe(path);

        await visible(page, 'sign-out-button').click();
        await page.waitForURL((url) => url.pathname === '/sign-in');
        await visible(page, 'sign-in-email').waitFor();
      } finally {
        await context.close();
      }
    },
  );
});

test('when the password is wrong, then the sign-in page says so and stays on sign-in', async () => {
  const { context, page } = await newPage(browser, PHONE);
  try {
    await signIn(page, 'practitioner@demo.fourpoint.test', 'not-the-demo-password');
    const error = visible(page, 'sign-in-error');
    await error.waitFor();
    expect((await error.textContent())?.length ?? 0).toBeGreaterThan(10);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, 'sign-in-wrong-password-phone');
  } finally {
    await context.close();
  }
});

test('when an operator opens the admin home, then the guard sends them to their clients', async () => {
  const { context, page } = await newPage(browser, PHONE);
  try {
    await signIn(page, 'operator@demo.fourpoint.test', password);
    await page.waitForURL((url) => url.pathname === '/clients');
    await page.goto('/admin');
    await page.waitForURL((url) => url.pathname === '/clients');
    await visible(page, 'operator-home').waitFor();
    expect(await page.getByTestId('admin-home').count()).toBe(0);
  } finally {
    await context.close();
  }
});
