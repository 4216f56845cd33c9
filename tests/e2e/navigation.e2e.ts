// Every section of every role at phone size (390x844): each one is reached by a tap on the bar, or on "More" and
// then the section, and its screen shows inside the viewport. A bar wider than the phone, or a section that only
// a sideways scroll would reveal, fails here.
import type { Page } from 'playwright-core';
import { browserForThisFile, newPage, PHONE, screenshot } from '@/tests/support/browser';
import { demoPassword } from './helpers/operator';

jest.setTimeout(240_000);

const browser = browserForThisFile();

const visible = (page: Page, testId: string) => page.getByTestId(testId).filter({ visible: true }).first();

// The sections of each role's layout (components/*/…-layout.tsx) and the screen each one opens.
const destinations = [
  {
    role: 'operator',
    home: '/clients',
    sections: [
      { tab: 'clients', screen: 'operator-home' },
      { tab: 'outbox', screen: 'outbox-screen' },
      { tab: 'account', screen: 'operator-account' },
    ],
  },
  {
    role: 'practitioner',
    home: '/sessions',
    sections: [
      { tab: 'sessions', screen: 'practitioner-home' },
      { tab: 'review-clients/index', screen: 'practitioner-clients' },
      { tab: 'follow-ups', screen: 'follow-ups-screen' },
    ],
  },
  {
    role: 'admin',
    home: '/admin',
    sections: [
      { tab: 'admin', screen: 'admin-home' },
      { tab: 'team', screen: 'team-screen' },
      { tab: 'client-records/index', screen: 'client-table-screen' },
      { tab: 'billing', screen: 'billing-screen' },
      { tab: 'audit', screen: 'audit-screen' },
      { tab: 'settings', screen: 'settings-screen' },
      { tab: 'conflicts/index', screen: 'conflicts-screen' },
      { tab: 'mailbox', screen: 'mailbox-screen' },
    ],
  },
] as const;

async function isInViewport(page: Page, testId: string): Promise<boolean> {
  const box = await visible(page, testId).boundingBox();
  return (
    box !== null &&
    box.x >= 0 &&
    box.y >= 0 &&
    box.x + box.width <= PHONE.width &&
    box.y + box.height <= PHONE.height
  );
}

test.each(destinations)(
  'when the $role uses a phone, then every section is reachable from the bar or its More menu',
  async ({ role, home, sections }) => {
    const { context, page } = await newPage(browser(), PHONE);
    try {
      await page.goto('/');
      await visible(page, 'sign-in-email').fill(`${role}@demo.fourpoint.test`);
      await visible(page, 'sign-in-password').fill(demoPassword);
      await visible(page, 'sign-in-submit').click();
      await page.waitForURL((url) => url.pathname === home);
      await visible(page, 'bottom-tabs').waitFor();

      const inBar = await page
        .getByTestId('bottom-tabs')
        .locator('[data-testid^="nav-"]')
        .evaluateAll((nodes) => nodes.map((node) => node.getAttribute('data-testid')));
      // Five places fit a 390 px bar with readable labels.
      expect(inBar.length).toBeLessThanOrEqual(5);

      for (const { tab, screen } of sections) {
        const button = `nav-${tab}`;
        if (!inBar.includes(button)) {
          expect(inBar).toContain('nav-more');
          await visible(page, 'nav-more').click();
          await visible(page, 'nav-more-menu').waitFor();
          expect(await isInViewport(page, button)).toBe(true);
          if (tab === sections[sections.length - 1].tab)
            await screenshot(page, `navigation-${role}-more-phone`);
        } else {
          expect(await isInViewport(page, button)).toBe(true);
        }
        await visible(page, button).click();
        await visible(page, screen).waitFor();
        expect(await page.getByTestId('nav-more-menu').filter({ visible: true }).count()).toBe(0);
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        expect(overflow).toBeLessThanOrEqual(0);
      }
    } finally {
      await context.close();
    }
  },
);
