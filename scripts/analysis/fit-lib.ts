import { frameFeatures, FEATURE_NAMES, FRAME_RATE, type FrameFeatures } from '../../shared/analysis/features';
import { estimateRate, type RateEstimate } from '../../shared/analysis/heart-rate';
import {
  emissionInput,
  STATE_COUNT,
  type DurationParameters,
  type HsmmModel,
} from '../../shared/analysis/hsmm';
import { preprocess } from '../../shared/analysis/preprocess';
import { annotatedHeartRate, frameLabels, readSamples, type Recording } from './circor';

export const CONTEXT_OFFSETS = [-3, -2, -1, 0, 1, 2, 3];
const L2 = 1e-4;

export interface PreparedRecording {
  recording: Recording;
  features: FrameFeatures;
  labels: Int8Array;
  rate: RateEstimate | null;
}

export function prepare(recording: Recording): PreparedRecording {
  const { samples, sampleRate } = readSamples(recording);
  const working = preprocess(samples, sampleRate);
  const features = frameFeatures(working.signal, working.sampleRate);
  const labels = frameLabels(recording.segments, features.frames, features.frameRate);
  return { recording, features, labels, rate: estimateRate(features.homomorphic, features.frameRate) };
}

function robustSpread(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const median = sorted[sorted.length >> 1];
  const deviations = sorted.map((v) => Math.abs(v - median)).sort((a, b) => a - b);
  return 1.4826 * deviations[deviations.length >> 1];
}

const mean = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;

/** Labelled runs fully inside annotated stretches (the neighbours on both sides are annotated too). */
function labelledRuns(prepared: PreparedRecording) {
  const runs: { state: number; length: number }[] = [];
  const segments = prepared.recording.segments;
  for (let i = 1; i < segments.length - 1; i++) {
    const s = segments[i];
    if (s.label < 1 || segments[i - 1].label === 0 || segments[i + 1].label === 0) continue;
    runs.push({ state: s.label - 1, length: s.endS - s.startS });
  }
  return runs;
}

export function fitDurations(training: PreparedRecording[]): DurationParameters {
  const byState: number[][] = [[], [], [], []];
  for (const p of training) for (const run of labelledRuns(p)) byState[run.state].push(run.length);
  const s1MeanS = mean(byState[0]);
  const s2MeanS = mean(byState[2]);
  const systoleResiduals: number[] = [];
  const diastolePoints: { predicted: number; spread: number }[] = [];
  for (const p of training) {
    // the spreads describe beat-to-beat variation around a right rate estimate; wrong estimates are the
    // candidate search's business, and would only blur the distributions
    const truth = annotatedHeartRate(p.recording.segments);
    if (!p.rate || !truth || Math.abs(p.rate.heartRateBpm - truth) > 0.05 * truth) continue;
    const runs = labelledRuns(p);
    const predictedSystole = p.rate.systoleS - s1MeanS;
    const predictedDiastole = p.rate.cycleS - p.rate.systoleS - s2MeanS;
    const diastoles: number[] = [];
    for (const run of runs) {
      if (run.state === 1) systoleResiduals.push(run.length - predictedSystole);
      if (run.state === 3) diastoles.push(run.length - predictedDiastole);
    }
    if (diastoles.length >= 3)
      diastolePoints.push({
        predicted: predictedDiastole,
        spread: Math.sqrt(mean(diastoles.map((d) => d * d))),
      });
  }
  // spread of diastole grows with its length: least squares of spread on predicted mean
  const xs = diastolePoints.map((d) => d.predicted);
  const ys = diastolePoints.map((d) => d.spread);
  const mx = mean(xs);
  const my = mean(ys);
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < xs.length; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
  }
  const slope = Math.max(0, sxx > 0 ? sxy / sxx : 0);
  const offset = Math.max(0.01, my - slope * mx);
  return {
    s1MeanS,
    s1StdS: robustSpread(byState[0]),
    s2MeanS,
    s2StdS: robustSpread(byState[2]),
    systoleStdS: robustSpread(systoleResiduals),
    diastoleStdSlope: slope,
    diastoleStdOffsetS: offset,
  };
}

/** Multinomial logistic regression by L-BFGS on the labelled frames. */
export function fitEmission(training: PreparedRecording[]): { weights: number[][]; statePriors: number[] } {
  const featureCount = FEATURE_NAMES.length;
  const width = CONTEXT_OFFSETS.length * featureCount;
  const rows: Float64Array[] = [];
  const targets: number[] = [];
  const scratch = new Float64Array(width);
  for (const p of training) {
    for (let t = 0; t < p.features.frames; t++) {
      if (p.labels[t] < 0) continue;
      emissionInput(p.features.series, CONTEXT_OFFSETS, t, scratch);
      rows.push(Float64Array.from(scratch));
      targets.push(p.labels[t]);
    }
  }
  const n = rows.length;
  const counts = new Array<number>(STATE_COUNT).fill(0);
  for (const y of targets) counts[y]++;
  const statePriors = counts.map((c) => c / n);
  const dims = STATE_COUNT * (width + 1);

  const lossAndGradient = (w: Float64Array, gradient: Float64Array): number => {
    gradient.fill(0);
    let loss = 0;
    const z = new Float64Array(STATE_COUNT);
    for (let i = 0; i < n; i++) {
      const x = rows[i];
      let top = -Infinity;
      for (let s = 0; s < STATE_COUNT; s++) {
        const base = s * (width + 1);
        let v = w[base + width];
        for (let k = 0; k < width; k++) v += w[base + k] * x[k];
        z[s] = v;
        top = Math.max(top, v);
      }
      let sum = 0;
      for (let s = 0; s < STATE_COUNT; s++) sum += Math.exp(z[s] - top);
      const logNorm = top + Math.log(sum);
      loss -= z[targets[i]] - logNorm;
      for (let s = 0; s < STATE_COUNT; s++) {
        const g = Math.exp(z[s] - logNorm) - (s === targets[i] ? 1 : 0);
        const base = s * (width + 1);
        for (let k = 0; k < width; k++) gradient[base + k] += g * x[k];
        gradient[base + width] += g;
      }
    }
    for (let j = 0; j < dims; j++) {
      gradient[j] = gradient[j] / n + L2 * w[j];
      loss += 0.5 * L2 * n * w[j] * w[j];
    }
    return loss / n;
  };

  const w = lbfgs(lossAndGradient, new Float64Array(dims), 80);
  const weights: number[][] = [];
  for (let s = 0; s < STATE_COUNT; s++)
    weights.push(Array.from(w.subarray(s * (width + 1), (s + 1) * (width + 1))));
  return { weights, statePriors };
}

function lbfgs(
  fn: (w: Float64Array, g: Float64Array) => number,
  start: Float64Array,
  iterations: number,
): Float64Array {
  const dims = start.length;
  const history = 8;
  const sList: Float64Array[] = [];
  const yList: Float64Array[] = [];
  let w = Float64Array.from(start);
  let g = new Float64Array(dims);
  let f = fn(w, g);
  const dot = (a: Float64Array, b: Float64Array) => {
    let s = 0;
    for (let i = 0; i < a.length; i++) s += a[i] * b[i];
    return s;
  };
  for (let iteration = 0; iteration < iterations; iteration++) {
    const q = Float64Array.from(g);
    const alphas: number[] = [];
    for (let i = sList.length - 1; i >= 0; i--) {
      const rho = 1 / dot(yList[i], sList[i]);
      const alpha = rho * dot(sList[i], q);
      alphas[i] = alpha;
      for (let j = 0; j < dims; j++) q[j] -= alpha * yList[i][j];
    }
    if (sList.length) {
      const last = sList.length - 1;
      const gamma = dot(sList[last], yList[last]) / dot(yList[last], yList[last]);
      for (let j = 0; j < dims; j++) q[j] *= gamma;
    }
    for (let i = 0; i < sList.length; i++) {
      const rho = 1 / dot(yList[i], sList[i]);
      const beta = rho * dot(yList[i], q);
      for (let j = 0; j < dims; j++) q[j] += sList[i][j] * (alphas[i] - beta);
    }
    const direction = q.map((v) => -v);
    let step = sList.length ? 1 : 1 / Math.max(1e-8, Math.sqrt(dot(g, g)));
    const slope = dot(g, direction);
    if (slope >= 0) break;
    const next = new Float64Array(dims);
    const nextGradient = new Float64Array(dims);
    let nextF = Infinity;
    for (let tries = 0; tries < 30; tries++) {
      for (let j = 0; j < dims; j++) next[j] = w[j] + step * direction[j];
      nextF = fn(next, nextGradient);
      if (nextF <= f + 1e-4 * step * slope) break;
      step /= 2;
    }
    const s = next.map((v, j) => v - w[j]);
    const y = nextGradient.map((v, j) => v - g[j]);
    if (dot(s, y) > 1e-12) {
      sList.push(s);
      yList.push(y);
      if (sList.length > history) {
        sList.shift();
        yList.shift();
      }
    }
    const improvement = f - nextF;
    w = next;
    g = nextGradient;
    f = nextF;
    if (improvement < 1e-9) break;
  }
  return w;
}

export function fitModel(training: PreparedRecording[], version: string): HsmmModel {
  const { weights, statePriors } = fitEmission(training);
  return {
    version,
    frameRate: FRAME_RATE,
    emission: { features: [...FEATURE_NAMES], contextOffsets: CONTEXT_OFFSETS, weights, statePriors },
    durations: fitDurations(training),
  };
}
