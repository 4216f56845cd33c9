import { readingOf } from './measurements';

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
});
