import { evaluateSite, readingOf, siteReferralReasons } from './measurements';

describe('readingOf', () => {
  // The 1996 ESC/NASPE Task Force standard takes short-term variability over 5-minute records (from memory);
  // a clip of seconds is far shorter, so its figure is read as something to follow across visits.
  test('when beat-interval variability of a clip is out of range, then it reads as a short-clip note to follow up', () => {
    for (const key of ['sdnnMs', 'rmssdMs', 'pnn50']) {
      const reading = readingOf('below', key);
      expect(reading).toContain('short clip');
      expect(reading).toContain('refer to a licensed clinician');
      expect(reading.startsWith('Below range')).toBe(true);
    }
    expect(readingOf('above', 'sdnnMs').startsWith('Above range for a short clip')).toBe(true);
  });

  test('when heart rate is out of range, then it still reads as a plain referral', () => {
    expect(readingOf('above', 'heartRateBpm')).toBe('Above range: refer to a licensed clinician');
    expect(readingOf('in_range', 'sdnnMs')).toBe('Within range');
  });

  test('when a measure that does not flag the session is out of range, then its reading never says refer', () => {
    for (const key of [
      's1DurationMs',
      's2DurationMs',
      'systoleMs',
      'diastoleMs',
      'systoleDiastoleRatio',
      's1s2PeakRatio',
    ]) {
      expect(readingOf('above', key)).toBe('Above range: note it and compare across visits');
      expect(readingOf('below', key)).not.toContain('refer');
    }
  });
});

describe('siteReferralReasons', () => {
  const metrics = { irregularRhythm: false };
  // The default shape: a rate band, and only an upper limit on activity in the rest intervals.
  const ranges = (key: string) =>
    key === 'heartRateBpm'
      ? { low: 60, high: 100, source: 'test range' }
      : { low: null, high: 0.45, source: 'test range' };
  const inRange = evaluateSite(
    { heartRateBpm: 72, systolicActivity: 0.1, diastolicActivity: 0.1 },
    'mitral',
    ranges,
  );

  test('when the murmur screen says possible, then the site flags with the murmur as its reason', () => {
    const screen = { murmur: 'possible' as const, score: 0.9, reasons: ['Sound through systole'] };
    expect(siteReferralReasons(metrics, inRange, screen)).toEqual(['Possible murmur']);
  });

  test('when the screen is unsure, unlikely or absent (an older analysis), then it adds no reason', () => {
    for (const murmur of ['unsure', 'unlikely'] as const)
      expect(siteReferralReasons(metrics, inRange, { murmur, score: 0.3, reasons: [] })).toEqual([]);
    expect(siteReferralReasons(metrics, inRange, null)).toEqual([]);
  });

  test('when the rate is above the range, then the reason names it with its value', () => {
    const fast = evaluateSite({ heartRateBpm: 112 }, 'mitral', (key) =>
      key === 'heartRateBpm' ? { low: 60, high: 100, source: 'test range' } : null,
    );
    expect(siteReferralReasons(metrics, fast, null)).toEqual([
      "Heart rate above the clinic's range (112 bpm)",
    ]);
  });
});
