import { analysePcm } from './analyse';
import { frameFeatures } from './features';
import { estimateRate } from './heart-rate';
import { preprocess } from './preprocess';
import { syntheticBeatTrain } from './synthetic';

const RATES = [40, 45, 50, 60, 72, 90, 110, 120, 130, 150, 165, 180];

// The requirement: synthetic beat trains of known rate from 40 to 180 bpm, within 1 bpm; the truth is
// the rate the train was built with.
describe('heart rate of synthetic beat trains', () => {
  for (const rateBpm of RATES) {
    test(`when the train beats at ${rateBpm} bpm, then the autocorrelation estimate and the reported rate are within 1 bpm`, () => {
      const { samples } = syntheticBeatTrain({
        rateBpm,
        durationS: 30,
        sampleRate: 4000,
        noise: 0.01,
        seed: rateBpm,
      });
      const working = preprocess(samples, 4000);
      const features = frameFeatures(working.signal, working.sampleRate);
      const estimate = estimateRate(features.homomorphic, features.frameRate);
      expect(estimate).not.toBeNull();
      expect(Math.abs((estimate?.heartRateBpm ?? 0) - rateBpm)).toBeLessThanOrEqual(1);
      const result = analysePcm(samples, 4000);
      expect(Math.abs((result.heartRateBpm ?? 0) - rateBpm)).toBeLessThanOrEqual(1);
    });
  }

  test('when the train beats at 72 bpm with a systole of 0.33 s, then the systolic-interval estimate is within 20 ms', () => {
    const { samples } = syntheticBeatTrain({
      rateBpm: 72,
      systoleS: 0.33,
      durationS: 30,
      sampleRate: 4000,
      noise: 0.01,
    });
    const working = preprocess(samples, 4000);
    const features = frameFeatures(working.signal, working.sampleRate);
    expect(
      Math.abs((estimateRate(features.homomorphic, features.frameRate)?.systoleS ?? 0) - 0.33),
    ).toBeLessThanOrEqual(0.02);
  });

  test('when the input is sampled at 44.1 kHz, then the rate is found as at 4 kHz', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 66, durationS: 15, sampleRate: 44100, noise: 0.01 });
    expect(Math.abs((analysePcm(samples, 44100).heartRateBpm ?? 0) - 66)).toBeLessThanOrEqual(1);
  });
});

describe('input sample rates', () => {
  for (const sampleRate of [2000, 8000, 11025, 22050, 48000, 44101, 96000]) {
    test(`when a 76 bpm train arrives at ${sampleRate} Hz, then the rate is within 1 bpm and sounds sit at input times`, () => {
      const train = syntheticBeatTrain({ rateBpm: 76, durationS: 12, sampleRate, noise: 0.01, seed: 5 });
      const result = analysePcm(train.samples, sampleRate);
      expect(result.sampleRate).toBe(sampleRate);
      expect(Math.abs((result.heartRateBpm ?? 0) - 76)).toBeLessThanOrEqual(1);
      const firstS1 = result.sounds.find((s) => s.type === 'S1' && s.startS > 1);
      const nearest = Math.min(...train.s1OnsetsS.map((t) => Math.abs(t - (firstS1?.startS ?? -10))));
      expect(nearest).toBeLessThan(0.06);
    });
  }
});
