// A session captured offline on the operator's phone drains to the clinic server when the network returns, and
// a practitioner on another device (another browser context) finds it with the server's own analysis.
//
// Heart sounds: the CirCor DigiScope dataset (Oliveira et al., "The CirCor DigiScope Dataset: From Murmur
// Detection to Murmur Classification", IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048), vendored in
// tests/fixtures/circor: subject 50296 (no murmur annotated), one recording per site, imported rather than
// recorded to keep the run short.
import fs from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { circorFixture } from '@/tests/support/circor-fixtures';
import {
  addClientAndStartSession,
  importSite,
  practitionerEmail,
  signIn,
  signInOperatorOnline,
  uniqueLetters,
  visible,
} from './helpers/operator';

jest.setTimeout(300_000);

const subject = '50296';
const sites = [
  { site: 'mitral', file: `${subject}_MV` },
  { site: 'tricuspid', file: `${subject}_TV` },
  { site: 'aortic', file: `${subject}_AV` },
  { site: 'pulmonic', file: `${subject}_PV` },
] as const;

/**
 * The dataset's own heart rate for a recording: 60 / median interval between the annotated S1 onsets (label 1
 * in the .tsv segmentation), the statistic the analysis reports.
 */
function annotatedBpm(file: string): number {
  const onsets = fs
    .readFileSync(circorFixture(`${file}.tsv`), 'utf8')
    .trim()
    .split('\n')
    .map((line) => line.split(/\s+/))
    .filter((cols) => cols[2] === '1')
    .map((cols) => Number(cols[0]));
  const intervals = onsets
    .slice(1)
    .map((t, i) => t - onsets[i])
    .sort((a, b) => a - b);
  const mid = Math.floor(intervals.length / 2);
  const median = intervals.length % 2 ? intervals[mid] : (intervals[mid - 1] + intervals[mid]) / 2;
  return 60 / median;
}

const client = { firstName: 'Tamsin', lastName: `Orrery${uniqueLetters()}`, dateOfBirth: '1979-06-14' };
const deviceRates = new Map<string, number>();

/** The heart rate the session view shows per site (NaN for "not measured"). */
async function serverRates(page: Page): Promise<Map<string, number>> {
  await visible(page, 'session-view').waitFor();
  const rates = new Map<string, number>();
  for (const { site } of sites) {
    const cell = visible(page, `site-${site}-measurements-heartRateBpm`);
    await cell.waitFor();
    rates.set(site, Number(/Heart rate\s*([\d.]+)/.exec((await cell.textContent()) ?? '')?.[1]));
  }
  return rates;
}

let browser: Browser;
let operator: { context: BrowserContext; page: Page };

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await operator?.context.close();
  await browser?.close();
});

async function outboxCounts(page: Page): Promise<{ total: number; sent: number; waiting: number }> {
  return page.evaluate(() => {
    const shown = (selector: string) =>
      Array.from(document.querySelectorAll(selector)).filter(
        (el) => (el as HTMLElement).offsetParent !== null,
      ).length;
    return {
      total: shown('[data-testid^="outbox-item-"]'),
      sent: shown('[data-testid^="outbox-item-"] [data-testid="outbox-state-sent"]'),
      waiting: shown('[data-testid^="outbox-item-"] [data-testid="outbox-state-waiting"]'),
    };
  });
}

describe('offline capture drained to the clinic', () => {
  test('when a session is captured and finished offline and the access token lapses, then the outbox holds it, waiting, and says it is offline', async () => {
    operator = await newPage(browser, PHONE);
    const { context, page } = operator;
    await signInOperatorOnline(page);
    await context.setOffline(true);
    await addClientAndStartSession(page, client);
    for (const { site, file } of sites)
      deviceRates.set(site, await importSite(page, site, circorFixture(`${file}.wav`)));
    await visible(page, 'review').waitFor();
    await visible(page, 'finish').click();
    await visible(page, 'capture-finished').waitFor();

    await page.goto('/outbox');
    await visible(page, 'outbox-list').waitFor();
    await visible(page, 'sync-panel').waitFor();
    expect(await visible(page, 'sync-status').textContent()).toMatch(/Offline/);
    // The engine tries on start and after the finish; offline each try ends with every item back to waiting.
    await page.waitForFunction(
      () =>
        document.querySelectorAll('[data-testid^="outbox-item-"] [data-testid="outbox-state-waiting"]')
          .length >= 11 && document.querySelectorAll('[data-testid="outbox-state-sending"]').length === 0,
      undefined,
      { timeout: 30_000, polling: 250 },
    );
    const clips = page.locator('[data-testid="outbox-item-clip"]').filter({ visible: true });
    expect(await clips.count()).toBe(4);
    const counts = await outboxCounts(page);
    // Client, consent, session and four site rows at least, plus the four clips; none has gone anywhere.
    expect(counts.total).toBeGreaterThanOrEqual(11);
    expect(counts.sent).toBe(0);
    expect(counts.waiting).toBe(counts.total);
    await screenshot(page, 'sync-outbox-before-phone');

    // An access token the server no longer accepts stands in for one that lapsed while offline.
    await page.evaluate(() => {
      const session = JSON.parse(localStorage.getItem('fourpoint.session.v1') ?? '{}') as {
        accessToken: string;
      };
      session.accessToken = 'lapsed-access-token';
      localStorage.setItem('fourpoint.session.v1', JSON.stringify(session));
    });
    await page.reload();
    await visible(page, 'outbox-list').waitFor();
    expect(await outboxCounts(page)).toMatchObject({ total: counts.total, sent: 0 });
  });

  test('when the network returns, then the token is refreshed and every session row and clip reaches "sent" without a tap', async () => {
    const { context, page } = operator;
    await context.setOffline(false);
    await page
      .waitForFunction(
        () => {
          const items = Array.from(document.querySelectorAll('[data-testid^="outbox-item-"]')).filter(
            (el) => (el as HTMLElement).offsetParent !== null && !el.textContent?.startsWith('Consent'),
          );
          return (
            items.length >= 10 && items.every((el) => el.querySelector('[data-testid="outbox-state-sent"]'))
          );
        },
        undefined,
        { timeout: 120_000, polling: 500 },
      )
      .catch(async (error: unknown) => {
        await screenshot(page, 'sync-outbox-stuck-phone');
        throw new Error(`${String(error)}\n${await visible(page, 'outbox-screen').textContent()}`);
      });
    const clips = page.locator('[data-testid="outbox-item-clip"]').filter({ visible: true });
    expect(await clips.count()).toBe(4);
    for (let i = 0; i < 4; i++) expect(await clips.nth(i).getByTestId('outbox-state-sent').count()).toBe(1);
    await visible(page, 'sync-now').waitFor();
    const token = await page.evaluate(
      () =>
        (JSON.parse(localStorage.getItem('fourpoint.session.v1') ?? '{}') as { accessToken?: string })
          .accessToken,
    );
    expect(token).not.toBe('lapsed-access-token');
    // The run ends with a pull of the clinic's changes; the screenshot shows the settled state.
    await page.waitForFunction(
      () => !document.querySelector('[data-testid="sync-status"]')?.textContent?.startsWith('Sending'),
      undefined,
      { timeout: 60_000 },
    );
    await screenshot(page, 'sync-outbox-after-phone');
  });

  // The device took consent offline against the clinic's published text it fetched after sign-in
  // (device/consent/clinic-consent-text.ts), so the server finds the text the row names.
  test('when the network returns, then the consent row is accepted as well', async () => {
    const { page } = operator;
    await visible(page, 'sync-now').click();
    const consent = page
      .locator('[data-testid="outbox-item-mutation"]')
      .filter({ visible: true, hasText: /^Consent/ })
      .first();
    await consent.getByTestId('outbox-state-sent').waitFor({ timeout: 15_000 });
  });

  test('when a practitioner signs in on another device, then the session is in the sessions table with the server’s heart rate at every site', async () => {
    const practitioner = await newPage(browser, WIDE);
    const { page } = practitioner;
    try {
      await signIn(page, practitionerEmail);
      await page.waitForURL((url) => url.pathname === '/sessions');
      await visible(page, 'sessions-table').waitFor();
      await visible(page, 'filter-search').fill(client.lastName);
      const row = page
        .locator('[data-testid^="session-row-"]')
        .filter({ visible: true, hasText: client.lastName });
      await row.first().waitFor({ timeout: 30_000 });
      expect(await row.count()).toBe(1);
      await screenshot(page, 'sync-practitioner-sessions-wide');
      await row.first().locator('[data-testid^="open-session-"]').click();
      await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
      expect(await visible(page, 'session-view').textContent()).toContain(
        `${client.firstName} ${client.lastName}`,
      );

      // The server analyses each clip after opening its seal, before it answers the upload.
      const rates = await serverRates(page);
      const measured = sites.filter(({ site }) => Number.isFinite(rates.get(site)));
      expect(measured.map((m) => m.site)).toEqual(sites.map((m) => m.site));
      for (const { site, file } of measured) {
        const serverBpm = rates.get(site)!;
        // The server re-ran the analysis on the opened clip: the same recording, so the device's rate.
        expect(Math.abs(serverBpm - deviceRates.get(site)!)).toBeLessThanOrEqual(2);
        // And near the dataset's annotation; 15 % allows for the few beats annotated (our tolerance, no source).
        const reference = annotatedBpm(file);
        expect(Math.abs(serverBpm - reference) / reference).toBeLessThanOrEqual(0.15);
      }
      await visible(page, 'caution-note').waitFor();
      await screenshot(page, 'sync-practitioner-session-wide');
    } finally {
      await practitioner.context.close();
    }
  });
});
