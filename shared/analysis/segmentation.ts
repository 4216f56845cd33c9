import { type FrameFeatures } from './features';
import { rateCandidates, withSwappedSystole, type RateEstimate } from './heart-rate';
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
  return best;
}

export interface StateRun {
  state: number;
  /** First frame. */
  start: number;
  /** One past the last frame. */
  end: number;
}

export function stateRuns(states: Uint8Array): StateRun[] {
  const runs: StateRun[] = [];
  let start = 0;
  for (let t = 1; t <= states.length; t++) {
    if (t === states.length || states[t] !== states[start]) {
      runs.push({ state: states[start], start, end: t });
      start = t;
    }
  }
  return runs;
}
