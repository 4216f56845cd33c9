// The records kept on the phone live in one SQLite file in the browser's private file system (OPFS), which only
// one page at a time may hold. A reload or a second tab must neither lose a record nor leave the app stuck.
// Expected behaviour is the product's own rule (DEVELOPERS.md, "Capture"); no outside source. The imported clip is
// from the CirCor DigiScope dataset (Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048), vendored
// in tests/fixtures/circor.
import { browserForThisFile, newPage, PHONE, screenshot, trackPage } from '@/tests/support/browser';
import { circorFixture } from '@/tests/support/circor-fixtures';
import {
  addClientAndStartSession,
  importSite,
  operatorEmail,
  signIn,
  uniqueLetters,
  visible,
} from './helpers/operator';
import { clientWithConsentAtTheClinic } from './helpers/api';

jest.setTimeout(180_000);

const browser = browserForThisFile();

async function addClient(page: import('playwright-core').Page, lastName: string): Promise<void> {
  await page.goto('/clients/new');
  await visible(page, 'client-form').waitFor();
  await visible(page, 'client-firstName').fill('Ilse');
  await visible(page, 'client-lastName').fill(lastName);
  await visible(page, 'client-submit').click();
}

describe('the records kept on the device', () => {
  test('when the page is reloaded again and again right after a save, then every reload opens the records and nothing saved is lost', async () => {
    const { context, page } = await newPage(browser(), PHONE);
    await signIn(page, operatorEmail);
    await page.waitForURL((url) => url.pathname === '/clients');
    const lastName = `Quillon${uniqueLetters()}`;
    await addClient(page, lastName);
    await visible(page, 'client-detail').waitFor();
    const clientPath = new URL(page.url()).pathname;
    for (let i = 0; i < 5; i++) {
      // No wait between loads: the page going away may still hold the file when the next one opens it.
      await page.reload();
      await visible(page, 'client-detail').waitFor({ timeout: 20_000 });
      expect(new URL(page.url()).pathname).toBe(clientPath);
      expect(await visible(page, 'client-detail').innerText()).toContain(lastName);
    }
    await context.close();
  });

  test('when Fourpoint is open in a second tab, then the second says why it cannot save, and saves once the first tab is closed, without a reload', async () => {
    const { context, page: first } = await newPage(browser(), PHONE);
    await signIn(first, operatorEmail);
    await first.waitForURL((url) => url.pathname === '/clients');
    await visible(first, 'operator-home').waitFor();

    const second = trackPage(await context.newPage());
    const lastName = `Tarrant${uniqueLetters()}`;
    await addClient(second, lastName);
    const refusal = visible(second, 'new-client-error');
    await refusal.waitFor({ timeout: 20_000 });
    expect(await refusal.innerText()).toMatch(
      /open in another tab or window\. Close the other one, then try again/,
    );
    // The form keeps what was typed.
    expect(await visible(second, 'client-lastName').inputValue()).toBe(lastName);
    await screenshot(second, 'local-store-second-tab-phone');

    await first.close();
    await visible(second, 'client-submit').click();
    await visible(second, 'client-detail').waitFor({ timeout: 20_000 });
    expect(await visible(second, 'client-detail').innerText()).toContain(lastName);
    await context.close();
  });

  test('when an unfinished session is discarded, then its takes are gone from the device and the client can start afresh', async () => {
    const { context, page } = await newPage(browser(), PHONE);
    await signIn(page, operatorEmail);
    await page.waitForURL((url) => url.pathname === '/clients');
    const capturePath = await addClientAndStartSession(page, {
      firstName: 'Perrin',
      lastName: `Castlemoor${uniqueLetters()}`,
      dateOfBirth: '1990-02-11',
    });
    await importSite(page, 'mitral', circorFixture('50296_MV.wav'));
    await visible(page, 'site-step-tricuspid').waitFor();

    await visible(page, 'discard-session').click();
    await visible(page, 'discard-session-confirm').waitFor();
    await screenshot(page, 'capture-discard-confirm-phone');
    await visible(page, 'discard-session-confirm-no').click();
    await visible(page, 'site-step-tricuspid').waitFor();

    await visible(page, 'discard-session').click();
    await visible(page, 'discard-session-confirm-yes').click();
    await page.waitForURL((url) => url.pathname.startsWith('/clients/'));
    await visible(page, 'client-detail').waitFor();
    await visible(page, 'consent-on-file').waitFor();
    expect(await page.getByTestId('resume-session').filter({ visible: true }).count()).toBe(0);
    await visible(page, 'start-session').waitFor();

    await page.goto(capturePath);
    await visible(page, 'capture-missing').waitFor();
    await context.close();
  });

  test('when the operator opens a client whose consent the clinic already holds, then it is not asked again, nor sent back with the session', async () => {
    const { context, page } = await newPage(browser(), PHONE);
    await signIn(page, operatorEmail);
    await page.waitForURL((url) => url.pathname === '/clients');
    // A client another phone added, with consent to the clinic's current text, already on the server.
    const lastName = `Ashgrove${uniqueLetters()}`;
    const { results: pushed } = await clientWithConsentAtTheClinic('Linnea', lastName);
    expect(pushed.map((r) => r.status)).toEqual(['applied', 'applied']);
    await page.reload();
    await visible(page, 'client-search').fill(lastName);
    await page
      .locator('[data-testid^="client-row-"]')
      .filter({ visible: true, hasText: lastName })
      .first()
      .click();
    await visible(page, 'client-detail').waitFor();
    const onFile = visible(page, 'consent-on-file');
    await onFile.waitFor();
    expect(await onFile.innerText()).toContain(`Signed by Linnea ${lastName}`);
    expect(await page.getByTestId('consent-form').filter({ visible: true }).count()).toBe(0);

    await visible(page, 'start-session').click();
    await page.waitForURL((url) => url.pathname.startsWith('/capture/'));
    await importSite(page, 'mitral', circorFixture('50296_MV.wav'));
    for (const site of ['tricuspid', 'aortic', 'pulmonic']) {
      await visible(page, `site-step-${site}`).waitFor();
      await visible(page, 'skip').click();
      await visible(page, 'skip-reason-0').click();
      await visible(page, 'skip-confirm').click();
    }
    await visible(page, 'review').waitFor();
    await visible(page, 'finish').click();
    await visible(page, 'capture-finished').waitFor();

    await page.goto('/outbox');
    await visible(page, 'outbox-list').waitFor();
    // Online, the outbox drains by itself: every item reaches "sent", and none of them is the consent.
    await page.waitForFunction(
      () => {
        const items = Array.from(document.querySelectorAll('[data-testid^="outbox-item-"]')).filter(
          (el) => (el as HTMLElement).offsetParent !== null,
        );
        return items.length > 0 && items.every((el) => el.querySelector('[data-testid="outbox-state-sent"]'));
      },
      undefined,
      { timeout: 60_000, polling: 250 },
    );
    const labels = await page
      .locator('[data-testid^="outbox-item-"]')
      .filter({ visible: true })
      .allInnerTexts();
    expect(labels.some((l) => l.includes('Session record'))).toBe(true);
    expect(labels.some((l) => /Consent/.test(l))).toBe(false);
    // The session's group carries the client's name, read from the client row.
    const group = page.locator('[data-testid="outbox-group-name"]').filter({ visible: true });
    expect(await group.allInnerTexts()).toContain(`Linnea ${lastName}`);
    expect(
      await page
        .getByTestId('outbox-group-progress')
        .filter({ visible: true, hasText: '1 of 1 recording sent' })
        .count(),
    ).toBeGreaterThanOrEqual(1);
    await context.close();
  });
});
