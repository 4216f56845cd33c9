import { axisLabelAnchor, axisLabelIndices } from './trend-axis';

const evenly = (n: number, from: number, to: number) =>
  Array.from({ length: n }, (_, i) => (n === 1 ? (from + to) / 2 : from + ((to - from) * i) / (n - 1)));

describe('trend chart dates', () => {
  test('when every date fits, then every visit has its date, the first starting and the last ending at its point', () => {
    expect(axisLabelIndices(evenly(4, 40, 640), 70)).toEqual([0, 1, 2, 3]);
    expect(axisLabelAnchor(0, 4)).toBe('start');
    expect(axisLabelAnchor(3, 4)).toBe('end');
    expect(axisLabelAnchor(1, 4)).toBe('middle');
  });

  test('when dates would overlap on a narrow chart, then the kept ones do not touch and the newest is always kept', () => {
    const xs = evenly(12, 40, 330);
    const kept = axisLabelIndices(xs, 70);
    expect(kept[kept.length - 1]).toBe(11);
    expect(kept[0]).toBe(0);
    const spans = kept.map((i) => {
      const a = axisLabelAnchor(i, xs.length);
      return a === 'start'
        ? [xs[i], xs[i] + 70]
        : a === 'end'
          ? [xs[i] - 70, xs[i]]
          : [xs[i] - 35, xs[i] + 35];
    });
    for (let k = 1; k < spans.length; k++) expect(spans[k][0]).toBeGreaterThanOrEqual(spans[k - 1][1] + 8);
    expect(kept.length).toBeLessThan(12);
  });

  test('when there is one visit, then its date is centred under it', () => {
    expect(axisLabelIndices([200], 70)).toEqual([0]);
    expect(axisLabelAnchor(0, 1)).toBe('middle');
  });
});
