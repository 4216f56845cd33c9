/**
 * Heart-cycle and systolic-interval estimate from the autocorrelation of the homomorphic envelope
 * (Schmidt et al. 2010; Springer et al., IEEE TBME 2016), widened to 30–200 bpm.
 */
export interface RateEstimate {
  heartRateBpm: number;
  cycleS: number;
  /** S1 onset to S2 onset. */
  systoleS: number;
  /** Normalised autocorrelation at the cycle lag: near 1 for a clean periodic signal, near 0 for noise. */
  periodicity: number;
  /** The cycle lag sits at the edge of the search range. */
  atSearchEdge: boolean;
}

export const MIN_RATE_BPM = 30;
export const MAX_RATE_BPM = 200;

export function autocorrelation(envelope: Float64Array, maxLag: number): Float64Array {
  const n = envelope.length;
  let mean = 0;
  for (const v of envelope) mean += v;
  mean /= n || 1;
  const centred = envelope.map((v) => v - mean);
  const out = new Float64Array(Math.min(maxLag, n - 1) + 1);
  for (let lag = 0; lag < out.length; lag++) {
    let sum = 0;
    for (let i = 0; i + lag < n; i++) sum += centred[i] * centred[i + lag];
    out[lag] = sum;
  }
  const zero = out[0] || 1;
  for (let lag = 0; lag < out.length; lag++) out[lag] /= zero;
  return out;
}

/** Normalised autocorrelation of the envelope at a lag of `cycleS`, interpolated between whole frames. */
export function periodicityAt(envelope: Float64Array, frameRate: number, cycleS: number): number {
  const lag = cycleS * frameRate;
  const below = Math.floor(lag);
  if (below + 1 >= envelope.length) return 0;
  const ac = autocorrelation(envelope, below + 1);
  const fraction = lag - below;
  return ac[below] * (1 - fraction) + ac[below + 1] * fraction;
}

/** Vertex of the parabola through (i-1, i, i+1). */
function refinePeak(y: Float64Array, i: number): number {
  if (i <= 0 || i >= y.length - 1) return i;
  const denominator = y[i - 1] - 2 * y[i] + y[i + 1];
  if (denominator >= 0) return i;
  const offset = (0.5 * (y[i - 1] - y[i + 1])) / denominator;
  return i + Math.max(-0.5, Math.min(0.5, offset));
}

function argMaxLocal(y: Float64Array, from: number, to: number): number {
  let best = -1;
  for (let i = Math.max(1, from); i <= Math.min(to, y.length - 2); i++) {
    if (y[i] >= y[i - 1] && y[i] >= y[i + 1] && (best < 0 || y[i] > y[best])) best = i;
  }
  return best;
}

function systoleFor(ac: Float64Array, cycleLag: number, frameRate: number): number {
  const cycleS = cycleLag / frameRate;
  const from = Math.max(1, Math.floor(Math.min(0.2, 0.3 * cycleS) * frameRate));
  const to = Math.ceil(0.5 * cycleLag);
  const peak = argMaxLocal(ac, from, to);
  return peak > 0 ? refinePeak(ac, peak) / frameRate : 0.4 * cycleS;
}

/** Local maxima of the autocorrelation in the 30–200 bpm lag range, highest first. */
export function rateCandidates(envelope: Float64Array, frameRate: number, limit = 4): RateEstimate[] {
  const minLag = Math.floor((60 / MAX_RATE_BPM) * frameRate);
  const maxLag = Math.ceil((60 / MIN_RATE_BPM) * frameRate);
  if (envelope.length < minLag * 3) return [];
  const ac = autocorrelation(envelope, maxLag + 1);
  const last = Math.min(maxLag, ac.length - 2);
  const peaks: number[] = [];
  for (let i = Math.max(1, minLag); i <= last; i++)
    if (ac[i] >= ac[i - 1] && ac[i] > ac[i + 1]) peaks.push(i);
  peaks.sort((a, b) => ac[b] - ac[a]);
  return peaks.slice(0, limit).map((peak) => {
    const cycleLag = refinePeak(ac, peak);
    const cycleS = cycleLag / frameRate;
    return {
      heartRateBpm: 60 / cycleS,
      cycleS,
      systoleS: systoleFor(ac, cycleLag, frameRate),
      periodicity: ac[peak],
      atSearchEdge: peak <= minLag + 1 || peak >= last - 1,
    };
  });
}

/**
 * The shortest cycle whose autocorrelation peak is nearly as high as the highest one in the 30–200 bpm range:
 * a steady rhythm repeats at two and three cycles almost as strongly as at one.
 */
export function estimateRate(envelope: Float64Array, frameRate: number): RateEstimate | null {
  const candidates = rateCandidates(envelope, frameRate, 6);
  if (candidates.length === 0) return null;
  const top = candidates[0].periodicity;
  return candidates.filter((c) => c.periodicity >= 0.9 * top).sort((a, b) => a.cycleS - b.cycleS)[0];
}
