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
  const adapted = viterbiSegment(
    recordingAdapted(emission, ownEvidence(features, model), best.states),
    stateDurations(model.durations, rate.cycleS, rate.systoleS, frameRate),
  );
  best = { ...best, states: adapted.states, logLikelihood: adapted.logLikelihood };
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

/** The linear envelopes repeat the log envelope's information: a diagonal Gaussian would count it three times. */
const OWN_EVIDENCE_FEATURES = ['logHomomorphic', 'band40to60', 'band150to250'];

function ownEvidence(features: FrameFeatures, model: HsmmModel): Float64Array[] {
  return OWN_EVIDENCE_FEATURES.map((name) => features.series[model.emission.features.indexOf(name)]).filter(
    (series): series is Float64Array => series !== undefined,
  );
}

/**
 * The emission model is shared by all recordings, but within one recording the S1 sounds resemble each other
 * and so do the S2 sounds: a diagonal Gaussian per sound type, over the log envelope and band powers of the
 * frames the first labelling gave each, adds the recording's own evidence of which sound a frame belongs to.
 */
function recordingAdapted(
  emission: Float64Array[],
  series: Float64Array[],
  states: Uint8Array,
): Float64Array[] {
  const features = series.length;
  const count = [0, 0];
  const sum = [new Float64Array(features), new Float64Array(features)];
  const squares = [new Float64Array(features), new Float64Array(features)];
  for (let t = 0; t < states.length; t++) {
    const k = states[t] === STATE_S1 ? 0 : states[t] === STATE_S2 ? 1 : -1;
    if (k < 0) continue;
    count[k]++;
    for (let f = 0; f < features; f++) {
      sum[k][f] += series[f][t];
      squares[k][f] += series[f][t] ** 2;
    }
  }
  if (count[0] < 10 || count[1] < 10) return emission;
  const mean = sum.map((s, k) => s.map((v) => v / count[k]));
  const variance = new Float64Array(features);
  for (let f = 0; f < features; f++) {
    const within = squares[0][f] - count[0] * mean[0][f] ** 2 + squares[1][f] - count[1] * mean[1][f] ** 2;
    variance[f] = Math.max(within / (count[0] + count[1] - 2), 1e-3);
  }
  const s1 = Float64Array.from(emission[STATE_S1]);
  const s2 = Float64Array.from(emission[STATE_S2]);
  for (let t = 0; t < states.length; t++) {
    let l1 = 0;
    let l2 = 0;
    for (let f = 0; f < features; f++) {
      l1 -= (series[f][t] - mean[0][f]) ** 2 / (2 * variance[f]);
      l2 -= (series[f][t] - mean[1][f]) ** 2 / (2 * variance[f]);
    }
    const top = Math.max(l1, l2);
    const norm = top + Math.log(Math.exp(l1 - top) + Math.exp(l2 - top)) - Math.LN2;
    s1[t] += l1 - norm;
    s2[t] += l2 - norm;
  }
  const out = [...emission];
  out[STATE_S1] = s1;
  out[STATE_S2] = s2;
  return out;
}
