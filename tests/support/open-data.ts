import { dataDir, openDataMissing } from '@/scripts/analysis/circor';

/**
 * `describe` for tests over the whole open CirCor data set (scripts/analysis/circor.ts finds it). Without the
 * folder, as in a fresh clone, the block is skipped and one line says why; tests that need only a recording or
 * two read tests/fixtures/circor instead (tests/support/circor-fixtures.ts) and always run.
 */
export function describeWithOpenData(title: string, body: () => void, dir = dataDir()): void {
  const missing = openDataMissing(dir);
  if (missing === null) {
    describe(title, body);
    return;
  }
  // Straight to stdout: jest's default reporter drops the console output of a file whose tests all skipped.
  process.stdout.write(`skipped: ${missing}\n`);
  describe.skip(`${title} (skipped: ${missing})`, body);
}
