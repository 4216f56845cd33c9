import { stateRuns } from './segmentation-runs';
export { stateRuns, type StateRun } from './segmentation-runs';
import { type FrameFeatures } from './features';
import { periodicityAt, rateCandidates, withSwappedSystole, type RateEstimate } from './heart-rate';
import { emissionLogLikelihoods, stateDurations, viterbiSegment, type HsmmModel } from './hsmm';

export interface SegmentationResult {
  /** One state per frame: 0 S1, 1 systole, 2 S2, 3 diastole. */
  states: Uint8Array;
  frameRate: number;
  rate: RateEstimate | null;
  logLikelihood: number;
}

export function segmentFrames(features: FrameFeatures, model: HsmmModel, candidates = 4): SegmentationResult {
  const emission = emissionLogLikelihoods(features.series, model.emission);
  let best: SegmentationResult = { states: new Uint8Array(features.frames).fill(3), frameRate: features.frameRate, rate: null, logLikelihood: -Infinity };
  // the highest autocorrelation peak is sometimes the S1–S2 lag or two cycles: let the model judge a few
  const rates = rateCandidates(features.homomorphic, features.frameRate, candidates).flatMap((r) => {
    const swapped = withSwappedSystole(r);
    return swapped ? [r, swapped] : [r];
  });
  for (const rate of rates) {
    const durations = stateDurations(model.durations, rate.cycleS, rate.systoleS, features.frameRate);
    const { states, logLikelihood } = viterbiSegment(emission, durations);
    if (logLikelihood > best.logLikelihood) best = { states, frameRate: features.frameRate, rate, logLikelihood };
  }
  if (best.rate) {
    // the autocorrelation peak is blurred by beat-to-beat variation; the first labelling measures the cycle better
    const measured = measuredRate(best.states, features.frameRate, best.rate);
    if (measured) {
      const durations = stateDurations(model.durations, measured.cycleS, measured.systoleS, features.frameRate);
      const { states, logLikelihood } = viterbiSegment(emission, durations);
      if (logLikelihood > best.logLikelihood) best = { states, frameRate: features.frameRate, rate: measured, logLikelihood };
    }
  }
  if (best.rate) best = { ...best, rate: { ...best.rate, periodicity: periodicityAt(features.homomorphic, features.frameRate, best.rate.cycleS) } };
  return best;
}


const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
};

function measuredRate(states: Uint8Array, frameRate: number, estimate: RateEstimate): RateEstimate | null {
  const sounds = stateRuns(states).filter((r) => r.state === 0 || r.state === 2);
  const cycles: number[] = [];
  const systoles: number[] = [];
  let lastS1 = -1;
  for (let i = 0; i < sounds.length; i++) {
    if (sounds[i].state !== 0) continue;
    if (lastS1 >= 0) cycles.push(sounds[i].start - lastS1);
    lastS1 = sounds[i].start;
    if (sounds[i + 1]?.state === 2) systoles.push(sounds[i + 1].start - sounds[i].start);
  }
  if (cycles.length < 3 || systoles.length < 3) return null;
  const cycleS = median(cycles) / frameRate;
  return { ...estimate, cycleS, heartRateBpm: 60 / cycleS, systoleS: median(systoles) / frameRate };
}
