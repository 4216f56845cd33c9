// The admin publishes a new version of the clinic's consent wording from the settings screen, and an operator's
// phone shows that version to the next client who signs. Expected behaviour is the product's own rule (a session
// records the consent version its client signed; DESIGN.md, "Business of the practice"); no outside source.
import { browserForThisFile, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { operatorEmail, signIn, uniqueLetters, visible } from './helpers/operator';

jest.setTimeout(180_000);

const browser = browserForThisFile();

test('when the admin publishes new consent wording, then it is the version in force and the operator’s phone asks the next client to sign it', async () => {
  const marker = `Recordings from this visit may be compared with earlier visits (${uniqueLetters()}).`;
  const admin = await newPage(browser(), WIDE);
  await signIn(admin.page, 'admin@demo.fourpoint.test');
  await admin.page.waitForURL((url) => url.pathname === '/admin');
  await visible(admin.page, 'nav-settings').click();
  const current = visible(admin.page, 'consent-current');
  await current.waitFor();
  const before = Number(/version (\d+)/.exec(await current.innerText())?.[1]);
  expect(before).toBeGreaterThanOrEqual(1);

  await visible(admin.page, 'consent-publish-open').click();
  const body = visible(admin.page, 'consent-publish-body');
  // The form starts from the wording in force.
  expect((await body.inputValue()).length).toBeGreaterThan(40);
  await body.fill('');
  await visible(admin.page, 'consent-publish-submit').click();
  await visible(admin.page, 'consent-publish-body-error').waitFor();

  await body.fill(
    `I agree that the clinic records the sounds of my heart at four places on my chest.\n\n${marker}`,
  );
  await visible(admin.page, 'consent-publish-submit').click();
  // Publishing makes every client sign again: it asks first and says so; "Keep editing" publishes nothing.
  const confirm = visible(admin.page, 'consent-publish-confirm');
  expect(await confirm.innerText()).toContain('Every client signs it at their next visit');
  await screenshot(admin.page, 'settings-consent-publish-confirm-wide');
  await visible(admin.page, 'consent-publish-confirm-no').click();
  await confirm.waitFor({ state: 'detached' });
  expect(await visible(admin.page, 'consent-current').innerText()).toContain(`version ${before}`);
  await visible(admin.page, 'consent-publish-submit').click();
  await visible(admin.page, 'consent-publish-confirm-yes').click();
  await visible(admin.page, 'consent-publish-form').waitFor({ state: 'detached' });
  await admin.page.waitForFunction(
    (version) =>
      document.querySelector('[data-testid="consent-current"]')?.textContent?.includes(`version ${version}`),
    before + 1,
  );
  expect(await visible(admin.page, 'consent-current-body').innerText()).toContain(marker);
  await visible(admin.page, 'consent-earlier-toggle').click();
  await visible(admin.page, `consent-version-${before}`).waitFor();
  await screenshot(admin.page, 'settings-consent-wording-wide');
  await admin.context.close();

  const operator = await newPage(browser(), PHONE);
  await signIn(operator.page, operatorEmail);
  await operator.page.waitForURL((url) => url.pathname === '/clients');
  await operator.page.goto('/clients/new');
  await visible(operator.page, 'client-firstName').fill('Oriel');
  await visible(operator.page, 'client-lastName').fill(`Banfield${uniqueLetters()}`);
  await visible(operator.page, 'client-submit').click();
  const form = visible(operator.page, 'consent-form');
  await form.waitFor();
  await operator.page.waitForFunction(
    (text) => document.querySelector('[data-testid="consent-form"]')?.textContent?.includes(text),
    marker,
    { timeout: 20_000 },
  );
  expect(await form.innerText()).toContain(`VERSION ${before + 1}`);
  await screenshot(operator.page, 'consent-new-wording-phone');
  await operator.context.close();
});
