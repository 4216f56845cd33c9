import { FEATURE_NAMES } from './features';
import { STATE_S1, STATE_S2 } from './hsmm';
import { stateRuns } from './segmentation-runs';

/**
 * Which of the two alternating sounds is S1. At fast rates systole and diastole last about as long, so the
 * duration model alone cannot tell; a recording-level logistic score weighs what else differs between the two
 * (the interval after each sound, its steadiness, the sound's length and spectrum). Each feature changes sign
 * when the labels are swapped, so the score needs no bias term.
 */
export const ORIENTATION_FEATURES = ['intervalRatio', 'intervalSpread', 'soundLength', 'highBand', 'lowBand'] as const;

export interface OrientationModel {
  features: string[];
  weights: number[];
}

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
};

const spread = (values: number[]) => {
  const m = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, b) => a + (b - m) ** 2, 0) / values.length);
};

/** Feature vector of a labelling (states per frame), or null when it holds too few cycles to judge. */
export function orientationFeatures(states: ArrayLike<number>, series: Float64Array[]): number[] | null {
  const runs = stateRuns(states);
  const sounds = runs.filter((r) => r.state === STATE_S1 || r.state === STATE_S2);
  const systoles: number[] = [];
  const diastoles: number[] = [];
  for (let i = 0; i + 1 < sounds.length; i++) {
    const gap = sounds[i + 1].start - sounds[i].start;
    if (sounds[i].state === STATE_S1 && sounds[i + 1].state === STATE_S2) systoles.push(gap);
    if (sounds[i].state === STATE_S2 && sounds[i + 1].state === STATE_S1) diastoles.push(gap);
  }
  if (systoles.length < 2 || diastoles.length < 2) return null;
  const high = series[FEATURE_NAMES.indexOf('band150to250')];
  const low = series[FEATURE_NAMES.indexOf('band40to60')];
  const classMean = (feature: Float64Array, state: number) => {
    let sum = 0;
    let count = 0;
    for (let t = 0; t < states.length; t++) {
      if (states[t] === state) {
        sum += feature[t];
        count++;
      }
    }
    return count ? sum / count : 0;
  };
  const lengths = (state: number) => sounds.filter((s) => s.state === state).map((s) => s.end - s.start);
  const meanOf = (v: number[]) => v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
  return [
    Math.log(median(systoles) / median(diastoles)),
    Math.log((spread(systoles) + 0.25) / (spread(diastoles) + 0.25)),
    Math.log(Math.max(meanOf(lengths(STATE_S1)), 0.5) / Math.max(meanOf(lengths(STATE_S2)), 0.5)),
    classMean(high, STATE_S1) - classMean(high, STATE_S2),
    classMean(low, STATE_S1) - classMean(low, STATE_S2),
  ];
}

/** Positive when the labelling looks right, negative when S1 and S2 look swapped. */
export function orientationScore(features: number[], model: OrientationModel): number {
  let score = 0;
  for (let i = 0; i < features.length; i++) score += features[i] * (model.weights[i] ?? 0);
  return score;
}

/** S1 ↔ S2 and systole ↔ diastole. */
export function swapSounds(states: Uint8Array): Uint8Array {
  return states.map((s) => s ^ 2);
}
