import { DEFAULT_RANGES, evaluateRange, rangeFor } from './index';

describe('reference ranges', () => {
  test('when a range table is read, then every metric and site has a unit and a stated source', () => {
    for (const bySite of Object.values(DEFAULT_RANGES)) {
      for (const range of Object.values(bySite)) {
        expect(range.unit.length).toBeGreaterThan(0);
        expect(range.source.length).toBeGreaterThan(10);
        if (range.low !== null && range.high !== null) expect(range.low).toBeLessThan(range.high);
      }
    }
  });
  // Physiology from memory (Bates' Guide to Physical Examination): S1 louder at the apex, S2 at the base.
  test('when the S1:S2 peak ratio ranges are compared, then apex sites expect S1 louder and base sites S2 louder', () => {
    expect(DEFAULT_RANGES.s1s2PeakRatio.mitral.low).toBeGreaterThanOrEqual(1);
    expect(DEFAULT_RANGES.s1s2PeakRatio.aortic.high).toBeLessThanOrEqual(1);
  });
  test('when values fall below, inside, above or outside any number, then the verdict says so', () => {
    const range = { low: 60, high: 100, unit: 'bpm', source: 'test' };
    expect(evaluateRange(55, range)).toBe('below');
    expect(evaluateRange(60, range)).toBe('within');
    expect(evaluateRange(101, range)).toBe('above');
    expect(evaluateRange(null, range)).toBe('unknown');
    expect(evaluateRange(NaN, range)).toBe('unknown');
    expect(evaluateRange(0.9, { low: null, high: 0.45, unit: 'ratio', source: 'test' })).toBe('above');
  });
  test('when a clinic sets its own limits, then they replace the default and the source says so', () => {
    const own = rangeFor('heartRateBpm', 'mitral', { heartRateBpm: { mitral: { low: 50 } } });
    expect(own.low).toBe(50);
    expect(own.high).toBe(100);
    expect(own.source).toBe('Set by the clinic.');
    expect(rangeFor('heartRateBpm', 'aortic', { heartRateBpm: { mitral: { low: 50 } } }).low).toBe(60);
  });
});
