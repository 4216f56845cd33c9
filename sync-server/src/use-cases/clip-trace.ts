import { toWorkingRate } from '@/shared/analysis/preprocess';
import { traceForDisplay } from '@/shared/analysis/trace';
import type { StoredTrace } from '@/shared/protocol/analysis';

/** Buckets per second of the trace kept for each clip: the review's trace, about four samples of the working rate. */
export const TRACE_BUCKETS_PER_SECOND = 250;

/**
 * The trace kept beside a clip: the band-passed clip (the same filter as the phone's trace, shared/analysis/trace.ts)
 * as min and max per bucket, scaled so the loudest bucket reaches ±1 and rounded to three places (it is for
 * drawing). The clip is brought to the analysis's working rate first, so a long 48 kHz clip is filtered at 1 kHz.
 */
export function traceOfClip(samples: ArrayLike<number>, sampleRate: number): StoredTrace {
  const working = toWorkingRate(samples, sampleRate);
  const durationS = sampleRate > 0 ? samples.length / sampleRate : 0;
  const buckets = Math.max(1, Math.round(durationS * TRACE_BUCKETS_PER_SECOND));
  const trace = traceForDisplay(Float32Array.from(working.signal), working.sampleRate, buckets);
  let peak = 1e-9;
  for (let i = 0; i < buckets; i++) peak = Math.max(peak, Math.abs(trace.min[i]), Math.abs(trace.max[i]));
  const scaled = (values: Float32Array) => Array.from(values, (v) => Math.round((v / peak) * 1000) / 1000);
  return {
    durationS,
    bucketsPerSecond: TRACE_BUCKETS_PER_SECOND,
    min: scaled(trace.min),
    max: scaled(trace.max),
  };
}

/**
 * The same trace with fewer points, one value per point (the larger excursion of its buckets, keeping its sign),
 * for a printed report where a line reads better than a band.
 */
export function traceLine(
  trace: StoredTrace,
  pointsPerSecond: number,
): { durationS: number; values: number[] } {
  const source = trace.min.length;
  const points = Math.max(1, Math.min(source, Math.round(trace.durationS * pointsPerSecond)));
  const values = new Array<number>(points);
  for (let p = 0; p < points; p++) {
    const from = Math.floor((p * source) / points);
    const to = Math.max(from + 1, Math.floor(((p + 1) * source) / points));
    let lo = 0;
    let hi = 0;
    for (let i = from; i < to; i++) {
      lo = Math.min(lo, trace.min[i]);
      hi = Math.max(hi, trace.max[i]);
    }
    values[p] = hi >= -lo ? hi : lo;
  }
  return { durationS: trace.durationS, values };
}
