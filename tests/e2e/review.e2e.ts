// The practitioner's review at 1440x900 against the demo clinic: open the demo client's latest session, compare
// it with an earlier visit, write findings, e-mail the report, and find it in the local mailbox; the PDF is
// turned into PNG pages (pdftoppm) and its text read back (pdftotext), both from Debian's poppler-utils.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { cautionParagraphs, clientCautionParagraphs } from '@/shared/cautions';
import { DOCUMENT_LOCALE, formatDay } from '@/shared/format/dates';
import { launchBrowser, newPage, PHONE, screenshot, screenshotDir, WIDE } from '@/tests/support/browser';
import { demoPassword } from './helpers/operator';

jest.setTimeout(180_000);

const password = demoPassword;
// The demo client with the most visits (sync-server/seeders/demo.ts, an invented person).
const demoClient = 'Wren Halloway';
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const visible = (page: Page, testId: string) => page.getByTestId(testId).filter({ visible: true }).first();

async function signIn(page: Page, email: string): Promise<void> {
  await page.goto('/');
  await visible(page, 'sign-in-email').waitFor();
  await visible(page, 'sign-in-email').fill(email);
  await visible(page, 'sign-in-password').fill(password);
  await visible(page, 'sign-in-submit').click();
}

test('when the practitioner reviews the demo client’s latest visit and sends the report, then the admin finds it in the mailbox with a readable PDF', async () => {
  // The follow-up day chosen on the calendar, read back from the PDF by the admin.
  let followUp = '';
  const findings = `Even S1 and S2 at all four sites; review ${Date.now()}.`;
  const { context, page } = await newPage(browser, WIDE);
  try {
    await signIn(page, 'practitioner@demo.fourpoint.test');
    await page.waitForURL((url) => url.pathname === '/sessions');
    await visible(page, 'sessions-table').waitFor();
    await screenshot(page, 'review-sessions-table');

    // Search narrows the server-side list; newest first by default, so the first row is the latest visit.
    await visible(page, 'filter-search').fill('Halloway');
    await page.waitForFunction(() => {
      const rows = Array.from(document.querySelectorAll('[data-testid^="session-row-"]'));
      return rows.length > 0 && rows.every((r) => r.textContent?.includes('Wren Halloway'));
    });
    const rows = page.locator('[data-testid^="session-row-"]').filter({ visible: true });
    expect(await rows.count()).toBe(4);
    expect(await visible(page, 'sessions-range').textContent()).toBe('1–4 of 4');
    await page.locator('[data-testid^="open-session-"]').filter({ visible: true }).first().click();
    await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
    const sessionId = new URL(page.url()).pathname.split('/').pop()!;

    for (const site of ['mitral', 'tricuspid', 'aortic', 'pulmonic'])
      await visible(page, `site-${site}-trace`).waitFor();
    expect(await visible(page, 'session-view').textContent()).toContain(demoClient);
    await page.locator('[data-testid="site-mitral-trace-S1"]').first().waitFor({ state: 'attached' });
    await page.locator('[data-testid="site-mitral-trace-S2"]').first().waitFor({ state: 'attached' });
    await visible(page, 'caution-note').waitFor();
    // The summary strip leads, in words: rate, recording quality, murmur screen, measures out of range.
    const summary = await visible(page, 'site-summary-mitral').textContent();
    expect(summary).toMatch(/\d+ bpm/);
    // Recording quality in the product's one verdict vocabulary (ui/verdicts.ts).
    expect(summary).toMatch(/Recording: (Good|Usable|Retake)/);
    expect(summary).toMatch(
      /Possible murmur: refer to a licensed clinician|No murmur pattern found|Could not tell|Murmur screen not run/,
    );
    expect(summary).toMatch(/All measures in range|\d+ measures? out of range/);
    // In the demo scenario a hum between S1 and S2 grows over this client's visits: by the latest one the murmur
    // screen finds a possible murmur, so the visit is flagged and the view says why, in the screen's words.
    expect(await visible(page, 'referral-state').textContent()).toContain('Flagged for referral');
    expect(await visible(page, 'session-view').textContent()).toContain(
      'Possible murmur: refer to a licensed clinician',
    );
    const rate = await visible(page, 'site-mitral-measurements-heartRateBpm').textContent();
    expect(rate).toMatch(/Heart rate/);
    expect(rate).toMatch(/\[\d+\]/);
    expect(rate).toMatch(/Within range|refer to a licensed clinician/);
    // Key measures first; the rest behind "More measures"; the sources in full in their own panel.
    expect(await page.getByTestId('site-mitral-measurements-s1DurationMs').count()).toBe(0);
    await visible(page, 'site-mitral-measurements-more').click();
    await visible(page, 'site-mitral-measurements-s1DurationMs').waitFor();
    expect(await visible(page, 'source-1').textContent()).toMatch(/^\[1\] .+\.$/);
    await screenshot(page, 'review-session-view');
    await visible(page, 'site-mitral-measurements-more').click();
    await visible(page, 'site-mitral-gestures').scrollIntoViewIfNeeded();

    // Zoom and pan along time.
    const before = await visible(page, 'site-mitral-window').textContent();
    await visible(page, 'site-mitral-zoom-in').click();
    const zoomed = await visible(page, 'site-mitral-window').textContent();
    expect(zoomed).not.toBe(before);
    await visible(page, 'site-mitral-pan-right').click();
    expect(await visible(page, 'site-mitral-window').textContent()).not.toBe(zoomed);
    await visible(page, 'site-mitral-zoom-out').click();

    // The same by hand: a drag to the left shows later time; Ctrl + wheel up zooms in around the pointer.
    const windowOf = async () =>
      (/([\d.]+)–([\d.]+) s/.exec((await visible(page, 'site-mitral-window').textContent()) ?? '') ?? [])
        .slice(1)
        .map(Number);
    const [start0, end0] = await windowOf();
    const box = (await visible(page, 'site-mitral-gestures').boundingBox())!;
    const y = box.y + box.height / 2;
    await page.mouse.move(box.x + box.width * 0.7, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.5, y, { steps: 8 });
    await page.mouse.move(box.x + box.width * 0.3, y, { steps: 8 });
    await page.mouse.up();
    const [start1, end1] = await windowOf();
    expect(start1).toBeGreaterThan(start0);
    expect(end1 - start1).toBeCloseTo(end0 - start0, 1);
    await page.keyboard.down('Control');
    await page.mouse.move(box.x + box.width / 2, y);
    await page.mouse.wheel(0, -120);
    await page.keyboard.up('Control');
    await page.waitForFunction((span) => {
      const m = /([\d.]+)–([\d.]+) s/.exec(
        document.querySelector('[data-testid="site-mitral-window"]')?.textContent ?? '',
      );
      return m !== null && Number(m[2]) - Number(m[1]) < span - 0.5;
    }, end1 - start1);

    // Playback moves a cursor over the trace.
    await visible(page, 'site-mitral-play').click();
    const cursor = page.getByTestId('site-mitral-trace-cursor').first();
    await cursor.waitFor({ state: 'attached', timeout: 15_000 });
    const x0 = Number(await cursor.getAttribute('x1'));
    await page.waitForTimeout(600);
    expect(Number(await cursor.getAttribute('x1'))).not.toBe(x0);
    await visible(page, 'site-mitral-play').click();

    // Compare with the earliest visit, laid over today's and aligned on S1.
    const visits = page.locator('[data-testid^="compare-visit-"]').filter({ visible: true });
    expect(await visits.count()).toBe(3);
    await visits.last().click();
    await visible(page, 'comparison-table').waitFor();
    const row = await visible(page, 'compare-mitral-heartRateBpm').textContent();
    expect(row).toMatch(/[\d.]+ then, [\d.]+ now/);
    await visible(page, 'site-mitral-then-trace').waitFor();
    await screenshot(page, 'review-compare-beside');
    await visible(page, 'compare-mode-over').click();
    await page.getByTestId('site-mitral-trace-overlay').first().waitFor({ state: 'attached' });
    await screenshot(page, 'review-compare-overlaid');
    await visible(page, 'comparison-table').scrollIntoViewIfNeeded();
    await screenshot(page, 'review-compare-table');

    // Findings, plan and follow-up, saved through the version check.
    await visible(page, 'notes-findings').fill(findings);
    await visible(page, 'notes-plan').fill('Repeat the four sites in six weeks.');
    // The follow-up day is chosen on the calendar (react-day-picker): days up to today are not offered.
    await visible(page, 'notes-follow-up-calendar-toggle').click();
    await visible(page, 'notes-follow-up-calendar').locator('td:not([data-disabled]) button').first().click();
    followUp = await visible(page, 'notes-follow-up').inputValue();
    expect(followUp > new Date().toISOString().slice(0, 10)).toBe(true);
    await visible(page, 'notes-follow-up-in-words').waitFor();
    await screenshot(page, 'review-follow-up-picked');
    await visible(page, 'notes-save').click();
    await visible(page, 'notes-saved').waitFor();

    // E-mail the report (with the comparison) to the client's address on file, read first in a preview.
    await visible(page, 'report-preview').click();
    const previewBody = await visible(page, 'report-mail-preview-body').textContent();
    expect(previewBody).toContain('Hello Wren Halloway');
    expect(previewBody).not.toContain('scope of your licence');
    await visible(page, 'report-mail-preview').scrollIntoViewIfNeeded();
    await screenshot(page, 'review-mail-preview');
    await visible(page, 'report-send').click();
    await visible(page, 'report-mail-sent').waitFor({ timeout: 30_000 });
    // The send's state in words, not the mail relay's own ("queued", "sending").
    expect(await visible(page, 'report-mail-sent').innerText()).toMatch(/^Sent\b/);
    await visible(page, 'report-panel').scrollIntoViewIfNeeded();
    await screenshot(page, 'review-findings-and-report');

    await visible(page, 'open-trends').click();
    await page.waitForURL((url) => url.pathname.endsWith('/trends'));
    await visible(page, 'trend-chart-mitral-heartRateBpm').waitFor();
    await page.getByTestId('trend-chart-mitral-heartRateBpm-band').first().waitFor({ state: 'attached' });
    await screenshot(page, 'review-trends');
    expect(sessionId).toMatch(/^[0-9a-f-]{36}$/);
  } finally {
    await context.close();
  }

  const admin = await newPage(browser, WIDE);
  try {
    await signIn(admin.page, 'admin@demo.fourpoint.test');
    await admin.page.waitForURL((url) => url.pathname !== '/sign-in' && url.pathname !== '/');
    await admin.page.goto('/mailbox');
    await visible(admin.page, 'mailbox-list').waitFor();
    const message = admin.page
      .locator('[data-testid^="mailbox-message-"]')
      .filter({ hasText: 'heart-sound report' })
      .first();
    await message.click();
    await visible(admin.page, 'mailbox-attachment-0').waitFor();
    const body = await visible(admin.page, 'mailbox-body').textContent();
    expect(body).toContain(cautionParagraphs[0]);
    await screenshot(admin.page, 'review-mailbox');
    const messageId = (await message.getAttribute('data-testid'))!.replace('mailbox-message-', '');

    // The attachment as the admin's browser gets it, through the API.
    const token = await admin.page.evaluate(() => {
      for (const store of [localStorage, sessionStorage]) {
        for (let i = 0; i < store.length; i++) {
          const value = store.getItem(store.key(i)!) ?? '';
          const match = /"accessToken":"([^"]+)"/.exec(value);
          if (match) return match[1];
        }
      }
      return null;
    });
    const pdfResponse = token
      ? await admin.page.request.get(`/api/admin/mailbox/messages/${messageId}/attachments/0`, {
          headers: { authorization: `Bearer ${token}` },
        })
      : await admin.page.request.get(
          `http://127.0.0.1:${process.env.MAIL_FAKE_HTTP_PORT}/api/messages/${messageId}/attachments/0`,
        );
    expect(pdfResponse.status()).toBe(200);
    const pdf = await pdfResponse.body();
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');

    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-report-'));
    const file = path.join(dir, 'report.pdf');
    fs.writeFileSync(file, pdf);
    fs.mkdirSync(screenshotDir, { recursive: true });
    for (const old of fs.readdirSync(screenshotDir).filter((f) => f.startsWith('review-report-page')))
      fs.rmSync(path.join(screenshotDir, old));
    execFileSync('/usr/bin/pdftoppm', [
      '-png',
      '-r',
      '80',
      file,
      path.join(screenshotDir, 'review-report-page'),
    ]);
    const pages = fs.readdirSync(screenshotDir).filter((f) => f.startsWith('review-report-page'));
    expect(pages.length).toBeGreaterThanOrEqual(1);
    const text = execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(
      /\s+/g,
      ' ',
    );
    expect(text).toContain('Harbour Lane Wellness');
    expect(text).toContain(demoClient);
    expect(text).toContain(findings);
    expect(text).toContain('Repeat the four sites in six weeks.');
    // The report writes dates one way: the document locale in the clinic's zone (the demo clinic's is UTC).
    const written = (day: string) => formatDay(day, { locale: DOCUMENT_LOCALE, timeZone: 'UTC' });
    expect(text).toContain(`Follow-up: ${written(followUp)}`);
    expect(text).toContain(`Compared with the visit of ${written('2026-05-06')}`);
    for (const p of clientCautionParagraphs) expect(text).toContain(p.slice(0, 50));
    // Written for the client (product brief, Cautions): no licence sentence, no unchecked sources, no jargon.
    expect(text).not.toContain('scope of your licence');
    expect(text).not.toMatch(/from memory/i);
    expect(text).not.toMatch(/SDNN|RMSSD|pNN50/);
    for (const site of ['Mitral', 'Tricuspid', 'Aortic', 'Pulmonic']) expect(text).toContain(site);
  } finally {
    await admin.context.close();
  }
});

test('when the practitioner filters for referral on a phone, then the demo’s flagged visit is listed and its view says why, in the same words', async () => {
  const { context, page } = await newPage(browser, PHONE);
  try {
    await signIn(page, 'practitioner@demo.fourpoint.test');
    await page.waitForURL((url) => url.pathname === '/sessions');
    await visible(page, 'filters-toggle').click();
    await visible(page, 'filter-flagged').click();
    await page.waitForFunction(() => {
      const rows = Array.from(document.querySelectorAll('[data-testid^="session-row-"]'));
      return rows.length > 0 && rows.some((r) => r.textContent?.includes('Callum Brightwater'));
    });
    await screenshot(page, 'review-flagged-phone');
    await page
      .locator('[data-testid^="session-row-"]')
      .filter({ visible: true, hasText: 'Callum Brightwater' })
      .first()
      .click();
    await page.waitForURL((url) => url.pathname.startsWith('/sessions/'));
    const state = await visible(page, 'referral-state').textContent();
    expect(state).toContain('Flagged for referral: refer to a licensed clinician');
    expect(await visible(page, 'referral-reasons').textContent()).toMatch(
      /Heart rate above the clinic's range/,
    );
    await visible(page, 'site-summary').waitFor();
    await screenshot(page, 'review-flagged-session-phone');
  } finally {
    await context.close();
  }
});
