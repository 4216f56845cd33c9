import * as fs from 'fs';
import * as path from 'path';
import { analysePcm } from './analyse';
import { decodeWav } from './wav';

/*
 * Held-out data: 150 more patients of the CirCor DigiScope Phonocardiogram Dataset v1.0.3 (Oliveira et al., IEEE
 * JBHI 2022, doi:10.1109/JBHI.2021.3137048; PhysioNet doi:10.13026/tshs-mw03), none of them used to fit the
 * committed model. Heart-rate truth as the dataset README defines it: 60 / the median interval between annotated
 * S1 onsets. The floors sit just under the figures measured when the rate check was added, so a regression fails.
 */
const circorDir = process.env.FOURPOINT_DATA_DIR ?? path.resolve(__dirname, '../../../shared/data/circor');
const heldOutDir = path.resolve(circorDir, '../circor-train');
const available = fs.existsSync(heldOutDir);
if (!available)
  console.log(`skipped: the held-out CirCor recordings are not beside the project (${heldOutDir})`);
const describeIfData = available ? describe : describe.skip;

function annotatedRate(tsv: string): number | null {
  const onsets = tsv
    .split('\n')
    .map((line) => line.trim().split(/\s+/).map(Number))
    .filter((p) => p.length === 3 && p[2] === 1)
    .map((p) => p[0]);
  const intervals = onsets.slice(1).map((t, i) => t - onsets[i]);
  if (intervals.length === 0) return null;
  intervals.sort((a, b) => a - b);
  const mid = intervals.length >> 1;
  return 60 / (intervals.length % 2 ? intervals[mid] : (intervals[mid - 1] + intervals[mid]) / 2);
}

describeIfData('heart rate on held-out CirCor recordings', () => {
  const rows: { id: string; truth: number; ours: number | null; verdict: string }[] = [];
  beforeAll(() => {
    for (const name of fs.readdirSync(heldOutDir).filter((n) => n.endsWith('.wav'))) {
      const id = name.replace(/\.wav$/, '');
      const truth = annotatedRate(fs.readFileSync(path.join(heldOutDir, `${id}.tsv`), 'utf8'));
      if (truth === null) continue;
      const { samples, sampleRate } = decodeWav(new Uint8Array(fs.readFileSync(path.join(heldOutDir, name))));
      const result = analysePcm(samples, sampleRate);
      rows.push({ id, truth, ours: result.heartRateBpm, verdict: result.quality.verdict });
    }
  });
  const off = (r: (typeof rows)[number]) => Math.abs((r.ours ?? Infinity) - r.truth);

  test('when a clip is called good, then its rate is more than 10 bpm off in at most 1 % of them (measured 0.6 %)', () => {
    const good = rows.filter((r) => r.verdict === 'good');
    const wrong = good.filter((r) => off(r) > 10);
    expect(rows.length).toBeGreaterThan(550);
    expect(wrong.length / good.length).toBeLessThanOrEqual(0.01);
  });

  test('when every clip is scored, then the rate is within 3 bpm on at least 78 % of them (measured 79 %)', () => {
    expect(rows.filter((r) => off(r) <= 3).length / rows.length).toBeGreaterThanOrEqual(0.78);
  });

  test('when the rate check is on, then at least 85 % of clips are still called good (measured 88 %)', () => {
    expect(rows.filter((r) => r.verdict === 'good').length / rows.length).toBeGreaterThanOrEqual(0.85);
  });
});
