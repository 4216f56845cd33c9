// After a failed end-to-end test: a screenshot of every open page in artifacts/screenshots/failure-*.png and
// the words each one showed, printed, so a failure on a CI machine says what the operator would have seen.
import { openPages, screenshot } from './browser';

declare global {
  var __fourpointFailedTest: string | undefined;
}

afterEach(async () => {
  const failed = globalThis.__fourpointFailedTest;
  if (!failed) return;
  const slug = failed
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .slice(0, 60);
  let index = 0;
  for (const page of openPages) {
    index += 1;
    try {
      const file = await screenshot(page, `failure-${slug}-${index}`);
      const words = (await page.locator('body').innerText({ timeout: 5_000 })).replace(/\n{2,}/g, '\n');
      console.log(
        `After "${failed}", page ${index} at ${page.url()} (${file}) showed:\n${words.slice(0, 2_000)}`,
      );
    } catch (error) {
      console.log(`After "${failed}", page ${index} could not be read: ${String(error)}`);
    }
  }
});
