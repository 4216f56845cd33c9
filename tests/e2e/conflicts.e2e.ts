// Two phones change the same client while apart; the second change arrives as a conflict, nothing is overwritten,
// and the admin settles it field by field on the wide screen. The phones' pushes go straight to the sync API, as
// the device engine sends them (shared/sync); the rule that a stale change becomes a conflict is the product's own
// (DESIGN.md, "Sync"), no outside source.
import { randomUUID } from 'node:crypto';
import { baseUrl, browserForThisFile, newPage, screenshot, WIDE } from '@/tests/support/browser';
import { push, tokenFor } from './helpers/api';
import { operatorEmail, signIn, uniqueLetters, visible } from './helpers/operator';

jest.setTimeout(180_000);

const browser = browserForThisFile();

const clientChange = (clientId: string) => ({ entity: 'clients' as const, id: clientId });

test('when two phones change the same client offline, then the admin sees both versions and keeps a field from each', async () => {
  const token = await tokenFor(operatorEmail);
  const [phoneA, phoneB] = [randomUUID(), randomUUID()];
  const clientId = randomUUID();
  const lastName = `Merriweather${uniqueLetters()}`;
  const created = await push(token, phoneA, {
    ...clientChange(clientId),
    baseVersion: 0,
    change: {
      firstName: 'Odile',
      lastName,
      dateOfBirth: '1984-07-09',
      email: 'odile.old@example.test',
      phone: '555 0100',
      notes: null,
    },
  });
  expect(created).toMatchObject({ status: 'applied', newVersion: 1 });
  // Both phones had version 1; A corrects the phone number, then B, still on version 1, changes both fields.
  expect(
    await push(token, phoneA, { ...clientChange(clientId), baseVersion: 1, change: { phone: '555 0123' } }),
  ).toMatchObject({ status: 'applied' });
  const stale = await push(token, phoneB, {
    ...clientChange(clientId),
    baseVersion: 1,
    change: { phone: '555 0999', email: 'odile.new@example.test' },
  });
  expect(stale.status).toBe('conflict');

  const { context, page } = await newPage(browser(), WIDE);
  await signIn(page, 'admin@demo.fourpoint.test');
  await page.waitForURL((url) => url.pathname === '/admin');
  await visible(page, 'attention-conflicts').waitFor();
  await visible(page, 'attention-conflicts-open').click();
  await visible(page, 'conflicts-screen').waitFor();
  await visible(page, `conflict-row-${stale.conflictId}`).click();
  await visible(page, 'conflict-detail').waitFor();
  await visible(page, 'version-differs-phone').waitFor();
  await visible(page, 'version-differs-email').waitFor();
  await screenshot(page, 'conflict-detail-wide');

  await visible(page, 'resolve-keep-fields').click();
  await visible(page, 'pick-phone-server').click();
  await visible(page, 'pick-email-client').click();
  await visible(page, 'resolve-note').fill('Phone confirmed at the desk; the new e-mail is from the client.');
  await visible(page, 'resolve-submit').click();
  await visible(page, 'conflict-resolved').waitFor();
  expect(await visible(page, 'conflict-resolved-note').innerText()).toContain('Phone confirmed at the desk');
  // Settled reads as settled: whose side each field kept, by whom and when; nothing still "differs".
  expect(await visible(page, 'conflict-status').innerText()).toBe('Settled');
  expect(await visible(page, 'conflict-resolved-by').innerText()).toMatch(
    /^✓ Settled by .+ on \d{1,2} [A-Z][a-z]{2,3} \d{4}, \d{2}:\d{2}$/,
  );
  expect(await visible(page, 'conflict-kept-server').innerText()).toMatch(/: Phone$/);
  expect(await visible(page, 'conflict-kept-client').innerText()).toMatch(/: E-mail$/);
  expect(await visible(page, 'version-kept-phone').innerText()).toBe('Kept the record');
  expect(await visible(page, 'version-kept-email').innerText()).toBe('Kept the change');
  expect(await page.getByTestId('conflict-differing').count()).toBe(0);
  expect(await page.locator('body').innerText()).not.toMatch(
    /both versions are kept|Differs|device [0-9a-f]{8}/,
  );
  await screenshot(page, 'conflict-settled-wide');
  await context.close();

  // The resolution is a new version of the row, with a field from each side.
  const adminToken = await tokenFor('admin@demo.fourpoint.test');
  const record = await fetch(`${baseUrl()}/api/client-records/${clientId}`, {
    headers: { authorization: `Bearer ${adminToken}` },
  });
  const { client } = (await record.json()) as { client: { phone: string; email: string; version: number } };
  expect(client).toMatchObject({ phone: '555 0123', email: 'odile.new@example.test' });
  expect(client.version).toBeGreaterThan(2);
});
