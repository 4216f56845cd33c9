import { isIrregular, median, pnn50, rmssd, sdnn } from './variability';

/*
 * Worked by hand from the definitions of the Task Force of the ESC and NASPE, "Heart rate variability:
 * standards of measurement, physiological interpretation and clinical use", Circulation 1996;93:1043–1065
 * (definitions quoted from memory):
 *   SDNN  = standard deviation of the NN intervals (square root of the variance; sample variance, N − 1).
 *   RMSSD = square root of the mean of the squared differences between adjacent NN intervals.
 *   pNN50 = NN50 (adjacent pairs differing by more than 50 ms) divided by the total number of NN intervals.
 *
 * Intervals 800, 860, 790, 900, 850 ms:
 *   mean = 4200 / 5 = 840
 *   deviations −40, 20, −50, 60, 10; squares 1600 + 400 + 2500 + 3600 + 100 = 8200
 *   SDNN = √(8200 / 4) = √2050 = 45.2769…
 *   differences 60, −70, 110, −50; squares 3600 + 4900 + 12100 + 2500 = 23100
 *   RMSSD = √(23100 / 4) = √5775 = 75.9934…
 *   NN50: 60 > 50, 70 > 50, 110 > 50, 50 is not more than 50 → 3; pNN50 = 3 / 5 = 60 %
 */
const intervals = [800, 860, 790, 900, 850];

describe('beat-interval variability (ESC/NASPE Task Force 1996)', () => {
  test('when given the worked example, then SDNN is √2050 ms', () => {
    expect(sdnn(intervals)).toBeCloseTo(45.2769, 4);
  });
  test('when given the worked example, then RMSSD is √5775 ms', () => {
    expect(rmssd(intervals)).toBeCloseTo(75.9934, 4);
  });
  test('when given the worked example, then pNN50 is 60 % (a 50 ms difference does not count)', () => {
    expect(pnn50(intervals)).toBeCloseTo(60, 10);
  });
  test('when fewer than two intervals exist, then the statistics are null', () => {
    expect(sdnn([800])).toBeNull();
    expect(rmssd([800])).toBeNull();
    expect(pnn50([])).toBeNull();
  });
  test('when intervals are identical, then SDNN and RMSSD are zero', () => {
    expect(sdnn([700, 700, 700])).toBe(0);
    expect(rmssd([700, 700, 700])).toBe(0);
  });
});

describe('rate and rhythm summaries', () => {
  test('when one interval in eight is a missed beat, then the median ignores it', () => {
    // sorted 600, 600, 600, 610, 610, 620, 620, 1220: the middle two are 610 and 610
    expect(median([600, 610, 600, 1220, 620, 610, 600, 620])).toBe(610);
  });
  // The irregularity rule is our own screening rule of thumb (common practice, no source).
  test('when intervals scatter widely around their median, then the rhythm is flagged irregular', () => {
    expect(isIrregular([600, 900, 620, 1000, 580, 950, 610, 640])).toBe(true);
  });
  test('when intervals vary by a few percent, then the rhythm is not flagged', () => {
    expect(isIrregular([800, 820, 790, 810, 805, 795, 815, 800])).toBe(false);
  });
});
