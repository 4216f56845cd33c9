import { type FrameFeatures } from './features';
import { periodicityAt, rateCandidates, type RateEstimate } from './heart-rate';
import {
  emissionLogLikelihoods,
  STATE_S1,
  STATE_S2,
  stateDurations,
  viterbiSegment,
  type HsmmModel,
} from './hsmm';
import { stateRuns } from './state-runs';
import { median } from './variability';

export { stateRuns, type StateRun } from './state-runs';

export interface SegmentationResult {
  /** One state per frame: 0 S1, 1 systole, 2 S2, 3 diastole. */
  states: Uint8Array;
  frameRate: number;
  rate: RateEstimate | null;
  logLikelihood: number;
}

export function segmentFrames(features: FrameFeatures, model: HsmmModel, candidates = 4): SegmentationResult {
  const { frameRate } = features;
  const emission = emissionLogLikelihoods(features.series, model.emission);
  let best: SegmentationResult = {
    states: new Uint8Array(features.frames).fill(3),
    frameRate,
    rate: null,
    logLikelihood: -Infinity,
  };
  const tryRate = (rate: RateEstimate) => {
    const { states, logLikelihood } = viterbiSegment(
      emission,
      stateDurations(model.durations, rate.cycleS, rate.systoleS, frameRate),
    );
    if (logLikelihood > best.logLikelihood) best = { states, frameRate, rate, logLikelihood };
  };
  // the highest autocorrelation peak is sometimes the S1–S2 lag or two cycles: let the model judge a few
  for (const rate of rateCandidates(features.homomorphic, frameRate, candidates)) tryRate(rate);
  if (!best.rate) return best;
  // beat-to-beat variation blurs the autocorrelation peak; each labelling measures the cycle and systole better,
  // so re-estimate from the path until the new durations no longer raise its likelihood (at most three rounds)
  for (let round = 0; round < 3; round++) {
    const measured = measuredRate(best.states, frameRate, best.rate as RateEstimate);
    if (!measured) break;
    tryRate(measured);
    if (best.rate !== measured) break;
  }
  const rate = best.rate as RateEstimate;
  return {
    ...best,
    rate: { ...rate, periodicity: periodicityAt(features.homomorphic, frameRate, rate.cycleS) },
  };
}

/** Median S1-to-S1 and S1-to-S2 onset intervals of a labelling. */
function measuredRate(states: Uint8Array, frameRate: number, estimate: RateEstimate): RateEstimate | null {
  const sounds = stateRuns(states).filter((r) => r.state === STATE_S1 || r.state === STATE_S2);
  const cycles: number[] = [];
  const systoles: number[] = [];
  let lastS1 = -1;
  for (let i = 0; i < sounds.length; i++) {
    if (sounds[i].state !== STATE_S1) continue;
    if (lastS1 >= 0) cycles.push(sounds[i].start - lastS1);
    lastS1 = sounds[i].start;
    if (sounds[i + 1]?.state === STATE_S2) systoles.push(sounds[i + 1].start - sounds[i].start);
  }
  const cycle = median(cycles);
  const systole = median(systoles);
  if (cycles.length < 3 || systoles.length < 3 || cycle === null || systole === null) return null;
  const cycleS = cycle / frameRate;
  return { ...estimate, cycleS, heartRateBpm: 60 / cycleS, systoleS: systole / frameRate };
}
