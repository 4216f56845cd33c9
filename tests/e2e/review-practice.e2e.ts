// The practitioner's side beyond one session, at 1440x900 and 390x844: Clients and Follow-ups beside Sessions, a
// client whose name is far longer than its column, trends whose ranges are open at one end (pNN50 "≤ 40", usable
// cycles "≥ 6", shared/ranges) with whole dates, Back to where the trends were opened from, and two visits side by
// side. The long-named client is pushed through the real sync as the demo operator's phone would.
import { randomUUID } from 'node:crypto';
import type { Page } from 'playwright-core';
import { baseUrl, browserForThisFile, newPage, PHONE, screenshot, WIDE } from '@/tests/support/browser';
import { clientWithConsentAtTheClinic, push, tokenFor } from './helpers/api';
import { operatorEmail, practitionerEmail, signIn, uniqueLetters, visible } from './helpers/operator';

jest.setTimeout(240_000);

const browser = browserForThisFile();
const first = `Maximiliana-Josephine ${uniqueLetters()}`;
const last = 'Featherstonehaugh-Vandermeulen-Montgomery-Oakhollow';
const longName = `${first} ${last}`;
let clientId: string;
let sessionId: string;

beforeAll(async () => {
  const added = await clientWithConsentAtTheClinic(first, last);
  expect(added.results.map((r) => r.status)).toEqual(['applied', 'applied']);
  clientId = added.clientId;
  sessionId = randomUUID();
  const followUp = new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10);
  const session = await push(await tokenFor(operatorEmail), randomUUID(), {
    entity: 'recording_sessions',
    id: sessionId,
    baseVersion: 0,
    change: {
      clientId,
      status: 'completed',
      startedAt: new Date().toISOString(),
      finishedAt: new Date().toISOString(),
      findings: null,
      plan: null,
      followUpDate: null,
    },
  });
  if (session.status !== 'applied') throw new Error(`The session was not stored: ${JSON.stringify(session)}`);
  // The follow-up is the practitioner's to set, through the notes as the session view saves them.
  const headers = {
    'content-type': 'application/json',
    authorization: `Bearer ${await tokenFor(practitionerEmail)}`,
  };
  const detail = (await (
    await fetch(`${baseUrl()}/api/review/sessions/${sessionId}`, { headers })
  ).json()) as {
    notes: { version: number };
  };
  const saved = await fetch(`${baseUrl()}/api/review/sessions/${sessionId}/notes`, {
    method: 'PUT',
    headers,
    body: JSON.stringify({
      findings: null,
      plan: null,
      followUpDate: followUp,
      baseVersion: detail.notes.version,
    }),
  });
  expect(saved.status).toBe(200);
});

async function box(page: Page, testId: string) {
  const found = await visible(page, testId).boundingBox();
  if (!found) throw new Error(`${testId} has no box`);
  return found;
}

/** The element a click at the middle of `testId` lands on belongs to `testId` itself. */
async function clickLandsOn(page: Page, testId: string): Promise<boolean> {
  const b = await box(page, testId);
  return page.evaluate(
    ({ x, y, id }) => {
      const hit = document.elementFromPoint(x, y);
      return hit !== null && hit.closest(`[data-testid="${id}"]`) !== null;
    },
    { x: b.x + b.width / 2, y: b.y + b.height / 2, id: testId },
  );
}

// A whole date in the browser's own written form (Unicode CLDR medium dates: "6 May 2026" in en-GB, "May 6, 2026"
// in en-US), never a cut one.
const wholeDate = /^(\d{1,2} [A-Z][a-z]{2,3} \d{4}|[A-Z][a-z]{2,3} \d{1,2}, \d{4})$/;

async function trendsLabelsAreWhole(page: Page, viewportWidth: number): Promise<void> {
  await visible(page, 'trend-chart-mitral-heartRateBpm').waitFor();
  await page.getByTestId('trend-chart-mitral-heartRateBpm-band').first().waitFor({ state: 'attached' });
  // Ranges open at one end read as such (shared/ranges: pNN50 high 40, usable cycles low 6).
  expect(await visible(page, 'trend-range-mitral-pnn50').textContent()).toContain('≤ 40');
  expect(await visible(page, 'trend-range-mitral-usableCycles').textContent()).toContain('≥ 6');
  const ranges = await page.locator('[data-testid^="trend-range-"]').allTextContents();
  for (const r of ranges) expect(r).not.toMatch(/—–|–—|——|range –|–\s*\(/);
  // Each date whole ("6 May 2026") and inside its chart, the last one included.
  const chart = await box(page, 'trend-chart-mitral-heartRateBpm');
  const dates = page.getByTestId('trend-chart-mitral-heartRateBpm-date');
  expect(await dates.count()).toBeGreaterThanOrEqual(2);
  for (const text of await dates.allTextContents()) expect(text).toMatch(wholeDate);
  const lastDate = (await dates.last().boundingBox())!;
  expect(lastDate.x + lastDate.width).toBeLessThanOrEqual(chart.x + chart.width + 0.5);
  expect(chart.x + chart.width).toBeLessThanOrEqual(viewportWidth);
  await visible(page, 'trends-murmur').waitFor();
}

test('when the practitioner works at 1440x900, then clients, follow-ups, long names, trends and side-by-side visits read right', async () => {
  const { context, page } = await newPage(browser(), WIDE);
  try {
    await signIn(page, practitionerEmail);
    await page.waitForURL((url) => url.pathname === '/sessions');

    // A long name stays in its column: it ends before the next column, the next column takes its own clicks,
    // and the whole name is the link's title.
    await visible(page, 'filter-search').fill(last);
    await visible(page, `open-session-${sessionId}`).waitFor();
    const name = await box(page, `session-client-cell-${sessionId}`);
    const link = await box(page, `open-session-${sessionId}`);
    const operator = await box(page, `only-operator-${sessionId}`);
    expect(link.x + link.width).toBeLessThanOrEqual(name.x + name.width + 0.5);
    expect(name.x + name.width).toBeLessThanOrEqual(operator.x);
    expect(await clickLandsOn(page, `only-operator-${sessionId}`)).toBe(true);
    expect(
      await page
        .getByTestId(`open-session-${sessionId}`)
        .first()
        .locator('[title]')
        .first()
        .getAttribute('title'),
    ).toBe(longName);
    await screenshot(page, 'practice-long-name-sessions-wide');

    // Clients beside Sessions: search, open the client, their visits, their trends, and Back to the client.
    await visible(page, 'nav-review-clients/index').click();
    await visible(page, 'practitioner-clients').waitFor();
    await visible(page, 'clients-search').fill(last);
    await visible(page, `clients-row-${clientId}`).waitFor();
    await screenshot(page, 'practice-clients-wide');
    await visible(page, `clients-row-${clientId}`).click();
    await visible(page, `client-visit-${sessionId}`).waitFor();
    await screenshot(page, 'practice-client-wide');

    // Follow-ups due: the client's follow-up in three days is listed, in words.
    await visible(page, 'nav-follow-ups').click();
    await visible(page, `follow-ups-row-${clientId}`).waitFor();
    expect(await visible(page, `follow-ups-due-${clientId}`).textContent()).toBe('In 3 days');
    await screenshot(page, 'practice-follow-ups-wide');
    await visible(page, `follow-ups-row-${clientId}`).click();
    expect(await visible(page, 'client-back').textContent()).toContain('Follow-ups due');

    // The demo client with four visits: trends from the client page, then Back to the client page.
    await visible(page, 'nav-review-clients/index').click();
    await visible(page, 'clients-search').fill('Halloway');
    await page
      .locator('[data-testid^="clients-row-"]')
      .filter({ visible: true, hasText: 'Wren' })
      .first()
      .click();
    await visible(page, 'client-open-trends').click();
    await page.waitForURL((url) => url.pathname.endsWith('/trends'));
    await trendsLabelsAreWhole(page, WIDE.width);
    await screenshot(page, 'practice-trends-wide');
    await visible(page, 'trends-back').click();
    await visible(page, 'client-visit-table').waitFor();

    // The latest visit against the earliest, side by side; then trends from the session and Back to it.
    await page.locator('[data-testid^="client-visit-"]').filter({ visible: true }).nth(1).click();
    await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
    const visitPath = new URL(page.url()).pathname;
    const visits = page.locator('[data-testid^="compare-visit-"]').filter({ visible: true });
    await visits.last().click();
    await visible(page, 'site-mitral-then-trace').waitFor();
    const now = await box(page, 'site-mitral-now');
    const then = await box(page, 'site-mitral-then');
    expect(then.x).toBeGreaterThanOrEqual(now.x + now.width);
    expect(Math.abs(then.y - now.y)).toBeLessThan(4);
    await visible(page, 'site-mitral-then').scrollIntoViewIfNeeded();
    await screenshot(page, 'practice-compare-beside-wide');
    const change = await visible(page, 'compare-mitral-heartRateBpm-change').textContent();
    expect(change).toMatch(/^(↑ higher by \S+ bpm|↓ lower by \S+ bpm|→ about the same)$/);
    await visible(page, 'comparison-table').scrollIntoViewIfNeeded();
    await screenshot(page, 'practice-compare-table-wide');
    await visible(page, 'open-trends').click();
    await page.waitForURL((url) => url.pathname.endsWith('/trends'));
    expect(await visible(page, 'trends-back').textContent()).toContain('Back to the visit');
    await visible(page, 'trends-back').click();
    await page.waitForURL((url) => url.pathname === visitPath);
  } finally {
    await context.close();
  }
});

test('when the practitioner works on a phone, then the same places are in the bar and nothing runs off the screen', async () => {
  const { context, page } = await newPage(browser(), PHONE);
  try {
    await signIn(page, practitionerEmail);
    await page.waitForURL((url) => url.pathname === '/sessions');
    await visible(page, 'filter-search').fill(last);
    const card = await box(page, `session-row-${sessionId}`);
    expect(card.x + card.width).toBeLessThanOrEqual(PHONE.width);
    await screenshot(page, 'practice-long-name-sessions-phone');

    await visible(page, 'nav-follow-ups').click();
    await visible(page, `follow-ups-row-${clientId}`).waitFor();
    await screenshot(page, 'practice-follow-ups-phone');

    await visible(page, 'nav-review-clients/index').click();
    await visible(page, 'clients-search').fill('Halloway');
    await page
      .locator('[data-testid^="clients-row-"]')
      .filter({ visible: true, hasText: 'Wren' })
      .first()
      .click();
    await visible(page, 'client-visit-table').waitFor();
    await screenshot(page, 'practice-client-phone');
    await visible(page, 'client-open-trends').click();
    await trendsLabelsAreWhole(page, PHONE.width);
    await screenshot(page, 'practice-trends-phone');
    await visible(page, 'trend-chart-mitral-pnn50').scrollIntoViewIfNeeded();
    await screenshot(page, 'practice-trends-open-range-phone');

    // On a phone "beside" puts the earlier visit under today's.
    await visible(page, 'trends-back').click();
    await page.locator('[data-testid^="client-visit-"]').filter({ visible: true }).nth(1).click();
    await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
    await page.locator('[data-testid^="compare-visit-"]').filter({ visible: true }).last().click();
    await visible(page, 'site-mitral-then-trace').waitFor();
    const now = await box(page, 'site-mitral-now');
    const then = await box(page, 'site-mitral-then');
    expect(then.y).toBeGreaterThanOrEqual(now.y + now.height - 1);
    expect(then.x + then.width).toBeLessThanOrEqual(PHONE.width);
    await visible(page, 'site-mitral-then').scrollIntoViewIfNeeded();
    await screenshot(page, 'practice-compare-phone');
    await visible(page, 'comparison-table').scrollIntoViewIfNeeded();
    await screenshot(page, 'practice-compare-table-phone');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
  } finally {
    await context.close();
  }
});
