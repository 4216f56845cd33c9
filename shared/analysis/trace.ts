import { bandPass } from './preprocess';

export interface DisplayTrace {
  durationS: number;
  min: Float32Array;
  max: Float32Array;
}

/** Band-passed (25–400 Hz, zero phase) minimum and maximum per bucket, for drawing a trace `points` wide. */
export function traceForDisplay(samples: Float32Array, sampleRate: number, points: number): DisplayTrace {
  const count = Math.max(0, Math.floor(points));
  const min = new Float32Array(count);
  const max = new Float32Array(count);
  const durationS = sampleRate > 0 ? samples.length / sampleRate : 0;
  if (count === 0 || samples.length === 0 || !(sampleRate > 800)) return { durationS, min, max };
  const filtered = bandPass(
    Float64Array.from(samples, (v) => (Number.isFinite(v) ? v : 0)),
    sampleRate,
  );
  for (let p = 0; p < count; p++) {
    const from = Math.floor((p * filtered.length) / count);
    const to = Math.max(from + 1, Math.floor(((p + 1) * filtered.length) / count));
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = from; i < Math.min(to, filtered.length); i++) {
      lo = Math.min(lo, filtered[i]);
      hi = Math.max(hi, filtered[i]);
    }
    min[p] = Number.isFinite(lo) ? lo : 0;
    max[p] = Number.isFinite(hi) ? hi : 0;
  }
  return { durationS, min, max };
}
