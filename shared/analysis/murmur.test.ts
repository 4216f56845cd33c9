import { analysePcm } from './analyse';
import { syntheticBeatTrain, type BeatTrainOptions } from './synthetic';
import { screensInVisit, visitMurmurScreen } from './murmur';
import type { MurmurScreen } from './types';

/*
 * Behaviour of the murmur screen on invented signals (shared/analysis/synthetic.ts): these check that the screen
 * reacts to sound filling systole and says when it cannot tell, not how accurate it is. Accuracy against the open
 * CirCor labels is in circor-murmur.test.ts.
 */
const SAMPLE_RATE = 4000;
const train = (extra: Partial<BeatTrainOptions>) =>
  syntheticBeatTrain({
    rateBpm: 72,
    durationS: 20,
    sampleRate: SAMPLE_RATE,
    noise: 0.002,
    seed: 11,
    ...extra,
  });

describe('murmur screen on synthetic beat trains', () => {
  test('when a loud holosystolic murmur fills every systole, then the site is a possible murmur with reasons in words', () => {
    const { samples } = train({ systolicMurmur: { amplitude: 0.12 } });
    const { screen, quality } = analysePcm(samples, SAMPLE_RATE);
    expect(quality.verdict).not.toBe('retake');
    expect(screen.murmur).toBe('possible');
    expect(screen.score).toBeGreaterThan(0.5);
    expect(screen.reasons.join(' ')).toMatch(/through systole/);
  });

  test('when the beat train is clean, then a murmur is unlikely', () => {
    const { samples } = train({});
    const { screen, quality } = analysePcm(samples, SAMPLE_RATE);
    expect(quality.verdict).toBe('good');
    expect(screen.murmur).toBe('unlikely');
    expect(screen.score).toBeLessThan(0.2);
    expect(screen.reasons.length).toBeGreaterThan(0);
  });

  test('when steady noise fills systole and diastole alike, then it is not taken for a murmur', () => {
    const { screen } = analysePcm(train({ noise: 0.06 }).samples, SAMPLE_RATE);
    expect(screen.murmur).toBe('unlikely');
  });

  test('when even a faint murmur fills systole of an otherwise clean train, then it is flagged', () => {
    const { screen } = analysePcm(train({ systolicMurmur: { amplitude: 0.02 } }).samples, SAMPLE_RATE);
    expect(screen.murmur).toBe('possible');
  });

  test('when the clip is only noise or too short, then the screen is unsure and says to retake', () => {
    const noise = syntheticBeatTrain({
      rateBpm: 72,
      durationS: 10,
      sampleRate: SAMPLE_RATE,
      noise: 0.3,
      dropChance: 1,
    });
    const short = train({ durationS: 3 });
    for (const samples of [noise.samples, short.samples]) {
      const { screen } = analysePcm(samples, SAMPLE_RATE);
      expect(screen.murmur).toBe('unsure');
      expect(screen.reasons.join(' ')).toMatch(/retake/);
    }
  });
});

describe('visitMurmurScreen', () => {
  const site = (murmur: MurmurScreen['murmur']) => ({ screen: { murmur, score: 0, reasons: [] } });

  test('when any site is a possible murmur, then the visit is, even beside unsure sites', () => {
    expect(visitMurmurScreen([site('unlikely'), site('unsure'), site('possible'), site('unlikely')])).toBe(
      'possible',
    );
  });

  test('when no site is possible but one could not be judged, then the visit is unsure', () => {
    expect(visitMurmurScreen([site('unlikely'), site('unsure')])).toBe('unsure');
  });

  test('when two sites are borderline (at or above the pair threshold) and none is possible alone, then the visit is possible; one borderline site is not enough', () => {
    const scored = (score: number) => ({ screen: { murmur: 'unlikely' as const, score, reasons: [] } });
    const model = { pairThreshold: 0.4 };
    expect(visitMurmurScreen([scored(0.45), scored(0.1), scored(0.41), scored(0.2)], model)).toBe('possible');
    expect(visitMurmurScreen([scored(0.45), scored(0.39), scored(0.1)], model)).toBe('unlikely');
    // an unsure site scores 0 and never counts as borderline
    expect(visitMurmurScreen([scored(0.45), site('unsure')], model)).toBe('unsure');
  });

  test('when every site is unlikely, then the visit is unlikely; with no screened site there is no call', () => {
    expect(visitMurmurScreen([site('unlikely'), site('unlikely')])).toBe('unlikely');
    expect(visitMurmurScreen([null, {}])).toBeNull();
  });
});

describe('screensInVisit', () => {
  const scored = (score: number): MurmurScreen => ({
    murmur: 'unlikely',
    score,
    reasons: [
      'systole is 1.2 times the level of diastole',
      'borderline: the visit is flagged as a possible murmur if…',
    ],
  });
  const model = { pairThreshold: 0.4 };

  test('when two sites are borderline, then exactly those two read possible with the visit’s reason first, and the rest are unchanged', () => {
    const [a, b, c, d] = screensInVisit([scored(0.45), scored(0.1), scored(0.41), null], model);
    expect(a).toMatchObject({ murmur: 'possible', score: 0.45 });
    expect(a!.reasons[0]).toMatch(/^borderline here and at another site of this visit/);
    expect(a!.reasons.some((r) => r.startsWith('borderline:'))).toBe(false);
    expect(c).toMatchObject({ murmur: 'possible', score: 0.41 });
    expect(b).toEqual(scored(0.1));
    expect(d).toBeNull();
    // What the sites say agrees with what the visit says.
    expect(
      visitMurmurScreen(
        [a, b, c, d].map((screen) => ({ screen })),
        model,
      ),
    ).toBe('possible');
  });

  test('when only one site is borderline, or one is possible on its own, then no site changes', () => {
    const one = [scored(0.45), scored(0.1)];
    expect(screensInVisit(one, model)).toEqual(one);
    const alone = [{ ...scored(0.95), murmur: 'possible' as const }, scored(0.45), scored(0.41)];
    expect(screensInVisit(alone, model)).toEqual(alone);
  });
});
