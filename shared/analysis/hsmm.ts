/**
 * Duration-dependent hidden semi-Markov segmentation into S1 → systole → S2 → diastole
 * (Springer et al., "Logistic regression-HSMM-based heart sound segmentation", IEEE TBME 2016):
 * logistic-regression emissions, Gaussian state durations tied to the rate estimate, and a Viterbi
 * search that lets the first and last state run past the clip edges.
 */

export const STATE_S1 = 0;
export const STATE_SYSTOLE = 1;
export const STATE_S2 = 2;
export const STATE_DIASTOLE = 3;
export const STATE_COUNT = 4;

export interface DurationParameters {
  s1MeanS: number;
  s1StdS: number;
  s2MeanS: number;
  s2StdS: number;
  /** Spread of the systole state around (estimated systolic interval − mean S1). */
  systoleStdS: number;
  /** Spread of the diastole state: slope × mean + offset. */
  diastoleStdSlope: number;
  diastoleStdOffsetS: number;
}

export interface EmissionModel {
  features: string[];
  contextOffsets: number[];
  /** One row per state: weights for each (offset, feature) pair, then the bias. */
  weights: number[][];
  statePriors: number[];
}

export interface HsmmModel {
  version: string;
  frameRate: number;
  emission: EmissionModel;
  durations: DurationParameters;
}

export interface StateDuration {
  min: number;
  max: number;
  logPdf: Float64Array;
  logSurvival: Float64Array;
}

function gaussianDuration(mean: number, std: number, min: number, max: number): StateDuration {
  const lo = Math.max(1, Math.round(min));
  const hi = Math.max(lo, Math.round(max));
  const pdf = new Float64Array(hi + 1);
  let total = 0;
  for (let d = lo; d <= hi; d++) {
    pdf[d] = Math.exp(-0.5 * ((d - mean) / std) ** 2);
    total += pdf[d];
  }
  const logPdf = new Float64Array(hi + 1).fill(-Infinity);
  const logSurvival = new Float64Array(hi + 1).fill(-Infinity);
  let tail = 0;
  for (let d = hi; d >= 1; d--) {
    if (d >= lo) tail += pdf[d] / total;
    logSurvival[d] = Math.log(Math.max(tail, 1e-300));
    if (d >= lo) logPdf[d] = Math.log(Math.max(pdf[d] / total, 1e-300));
  }
  return { min: lo, max: hi, logPdf, logSurvival };
}

/** Per-state duration distributions in frames, for a cycle and systolic interval in seconds. */
export function stateDurations(
  params: DurationParameters,
  cycleS: number,
  systoleS: number,
  frameRate: number,
): StateDuration[] {
  const f = frameRate;
  const s1Mean = params.s1MeanS * f;
  const s1Std = Math.max(params.s1StdS * f, 0.5);
  const s2Mean = params.s2MeanS * f;
  const s2Std = Math.max(params.s2StdS * f, 0.5);
  const systoleMean = Math.max(systoleS * f - s1Mean, 1);
  const systoleStd = Math.max(params.systoleStdS * f, 0.5);
  const diastoleMean = Math.max((cycleS - systoleS) * f - s2Mean, 1);
  const diastoleStd = Math.max(params.diastoleStdSlope * diastoleMean + params.diastoleStdOffsetS * f, 0.5);
  return [
    gaussianDuration(s1Mean, s1Std, s1Mean - 3 * s1Std, s1Mean + 3 * s1Std),
    gaussianDuration(systoleMean, systoleStd, systoleMean - 3 * systoleStd, systoleMean + 3 * systoleStd),
    gaussianDuration(s2Mean, s2Std, s2Mean - 3 * s2Std, s2Mean + 3 * s2Std),
    gaussianDuration(
      diastoleMean,
      diastoleStd,
      diastoleMean - 3 * diastoleStd,
      diastoleMean + 3 * diastoleStd,
    ),
  ];
}

/** Frame-wise log P(state | features) from the multinomial logistic model, divided by the state prior. */
export function emissionLogLikelihoods(series: Float64Array[], model: EmissionModel): Float64Array[] {
  if (series.length !== model.features.length) {
    throw new Error(`The model expects ${model.features.length} feature series, got ${series.length}.`);
  }
  const frames = series[0]?.length ?? 0;
  const out = Array.from({ length: STATE_COUNT }, () => new Float64Array(frames));
  const { contextOffsets, weights, statePriors } = model;
  const width = contextOffsets.length * series.length;
  const input = new Float64Array(width);
  const logits = new Float64Array(STATE_COUNT);
  const logPriors = statePriors.map((p) => Math.log(p));
  for (let t = 0; t < frames; t++) {
    emissionInput(series, contextOffsets, t, input);
    let top = -Infinity;
    for (let s = 0; s < STATE_COUNT; s++) {
      const w = weights[s];
      let z = w[width];
      for (let k = 0; k < width; k++) z += w[k] * input[k];
      logits[s] = z;
      top = Math.max(top, z);
    }
    let sum = 0;
    for (let s = 0; s < STATE_COUNT; s++) sum += Math.exp(logits[s] - top);
    const logNorm = top + Math.log(sum);
    for (let s = 0; s < STATE_COUNT; s++) out[s][t] = logits[s] - logNorm - logPriors[s];
  }
  return out;
}

export function emissionInput(
  series: Float64Array[],
  offsets: number[],
  t: number,
  into: Float64Array,
): void {
  const frames = series[0].length;
  let k = 0;
  for (const offset of offsets) {
    const u = Math.min(frames - 1, Math.max(0, t + offset));
    for (const feature of series) into[k++] = feature[u];
  }
}

export interface Segmentation {
  states: Uint8Array;
  logLikelihood: number;
}

/** Best state sequence under cyclic order S1 → systole → S2 → diastole → S1. */
export function viterbiSegment(logEmission: Float64Array[], durations: StateDuration[]): Segmentation {
  const T = logEmission[0].length;
  const states = new Uint8Array(T);
  if (T === 0) return { states, logLikelihood: -Infinity };
  const cumulative = logEmission.map((e) => {
    const c = new Float64Array(T + 1);
    for (let t = 0; t < T; t++) c[t + 1] = c[t] + e[t];
    return c;
  });
  const previous = (s: number) => (s + STATE_COUNT - 1) % STATE_COUNT;
  const logStart = Math.log(1 / STATE_COUNT);
  // best[s][t]: best log-probability of a path whose segment in state s ends just before frame t
  const best = Array.from({ length: STATE_COUNT }, () => new Float64Array(T + 1).fill(-Infinity));
  const back = Array.from({ length: STATE_COUNT }, () => new Uint16Array(T + 1));
  const firstLog = durations.map((d) => {
    let mean = 0;
    let mass = 0;
    for (let k = d.min; k <= d.max; k++) {
      const p = Math.exp(d.logPdf[k]);
      mean += k * p;
      mass += p;
    }
    return -Math.log(Math.max(mean / (mass || 1), 1));
  });

  let bestScore = 0;
  let bestLength = 0;
  // writes the best score and duration of a segment in state s ending just before frame t into bestScore/bestLength
  const scoreEnd = (s: number, t: number, useSurvival: boolean) => {
    const d = durations[s];
    const c = cumulative[s];
    const prior = best[previous(s)];
    const ct = c[t];
    let top = -Infinity;
    let arg = 0;
    const limit = Math.min(d.max, t - 1);
    const durationLog = useSurvival ? d.logSurvival : d.logPdf;
    for (let k = useSurvival ? 1 : d.min; k <= limit; k++) {
      const start = t - k;
      const score = prior[start] + durationLog[k] + ct - c[start];
      if (score > top) {
        top = score;
        arg = k;
      }
    }
    if (t <= d.max) {
      // the clip may open partway through a state
      const score = logStart + d.logSurvival[t] + firstLog[s] + ct - c[0];
      if (score > top) {
        top = score;
        arg = t;
      }
    }
    bestScore = top;
    bestLength = arg;
  };

  for (let t = 1; t < T; t++) {
    for (let s = 0; s < STATE_COUNT; s++) {
      scoreEnd(s, t, false);
      best[s][t] = bestScore;
      back[s][t] = bestLength;
    }
  }
  let endState = 0;
  let endScore = -Infinity;
  for (let s = 0; s < STATE_COUNT; s++) {
    scoreEnd(s, T, true);
    best[s][T] = bestScore;
    back[s][T] = bestLength;
    if (bestScore > endScore) {
      endScore = bestScore;
      endState = s;
    }
  }

  let t = T;
  let s = endState;
  while (t > 0) {
    const length = back[s][t] || 1;
    states.fill(s, Math.max(0, t - length), t);
    t -= length;
    s = previous(s);
  }
  return { states, logLikelihood: endScore };
}
