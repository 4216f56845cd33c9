import { analysePcm } from './analyse';
import { syntheticBeatTrain, type BeatTrainOptions } from './synthetic';

// The promise: the rate of record is right, or the verdict is not "good" and says why. The truth is the rate
// the synthetic train was built with (for a drifting train there is no single right rate, so it must be flagged).
const hasDoubt = (result: ReturnType<typeof analysePcm>) =>
  result.quality.reasons.some((r) => r.code === 'rate_unsure');

function analyseTrain(options: Partial<BeatTrainOptions> & { rateBpm: number }) {
  const train = syntheticBeatTrain({ durationS: 30, sampleRate: 4000, noise: 0.01, seed: 11, ...options });
  return analysePcm(train.samples, 4000);
}

describe('a heart rate you can trust on steady trains', () => {
  for (const rateBpm of [40, 50, 60, 72, 90, 110, 130, 150, 180, 200]) {
    test(`when a steady train beats at ${rateBpm} bpm, then the rate is within 2 bpm and no doubt is raised`, () => {
      // ±2 % beat-to-beat jitter: the median interval sits within about 1 % of the built cycle.
      const result = analyseTrain({ rateBpm, seed: rateBpm, jitter: 0.02 });
      expect(Math.abs((result.heartRateBpm ?? 0) - rateBpm)).toBeLessThanOrEqual(2);
      expect(hasDoubt(result)).toBe(false);
    });
  }
});

describe('the rate is right or the verdict says it is unsure', () => {
  const cases: [string, Partial<BeatTrainOptions> & { rateBpm: number }][] = [];
  for (const rateBpm of [40, 60, 90, 120, 160, 200]) {
    for (const chance of [0.1, 0.25, 0.4]) {
      cases.push([
        `${100 * chance} % of beats are missing at ${rateBpm} bpm`,
        { rateBpm, dropChance: chance },
      ]);
      cases.push([
        `${100 * chance} % of beats are followed by a premature beat at ${rateBpm} bpm`,
        { rateBpm, extraBeatChance: chance },
      ]);
    }
  }
  for (const [label, options] of cases) {
    test(`when ${label}, then the rate is within 3 bpm or the verdict is not good and names the doubt`, () => {
      const result = analyseTrain(options);
      const right = Math.abs((result.heartRateBpm ?? Infinity) - options.rateBpm) <= 3;
      if (!right) {
        expect(result.quality.verdict).not.toBe('good');
        expect(hasDoubt(result) || result.quality.reasons.length > 0).toBe(true);
      }
    });
  }

  for (const [from, to] of [
    [60, 100],
    [110, 70],
    [45, 80],
  ]) {
    test(`when the rate drifts from ${from} to ${to} bpm over the take, then the verdict is not good and says the rate changed`, () => {
      const result = analyseTrain({ rateBpm: from, endRateBpm: to });
      expect(result.quality.verdict).not.toBe('good');
      const doubt = result.quality.reasons.find((r) => r.code === 'rate_unsure');
      expect(doubt?.message).toMatch(/the rate changed during the take/);
      expect(doubt?.message).toMatch(/Count the pulse by hand/);
    });
  }
});
