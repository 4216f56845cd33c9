/**
 * Beat-interval statistics as the Task Force of the ESC and NASPE defines them ("Heart rate variability:
 * standards of measurement, physiological interpretation and clinical use", Circulation 1996;93:1043–1065),
 * applied to S1-to-S1 intervals in place of NN intervals.
 */

/** SDNN: standard deviation of the intervals. The standard says "square root of variance"; we take the sample variance (divide by N − 1). */
export function sdnn(intervalsMs: number[]): number | null {
  if (intervalsMs.length < 2) return null;
  const mean = intervalsMs.reduce((a, b) => a + b, 0) / intervalsMs.length;
  const sumSquares = intervalsMs.reduce((a, b) => a + (b - mean) ** 2, 0);
  return Math.sqrt(sumSquares / (intervalsMs.length - 1));
}

/** RMSSD: square root of the mean of the squared differences between adjacent intervals. */
export function rmssd(intervalsMs: number[]): number | null {
  if (intervalsMs.length < 2) return null;
  let sum = 0;
  for (let i = 1; i < intervalsMs.length; i++) sum += (intervalsMs[i] - intervalsMs[i - 1]) ** 2;
  return Math.sqrt(sum / (intervalsMs.length - 1));
}

/** pNN50 in percent: NN50 (adjacent pairs differing by more than 50 ms) divided by the total number of intervals. */
export function pnn50(intervalsMs: number[]): number | null {
  if (intervalsMs.length < 2) return null;
  let count = 0;
  for (let i = 1; i < intervalsMs.length; i++)
    if (Math.abs(intervalsMs[i] - intervalsMs[i - 1]) > 50) count++;
  return (100 * count) / intervalsMs.length;
}

export function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * Irregular when more than a fifth of the intervals lie over 20 % away from the median interval
 * (common practice, no source: a screening rule of thumb, not a rhythm diagnosis).
 */
export function isIrregular(intervalsMs: number[]): boolean {
  const mid = median(intervalsMs);
  if (mid === null || intervalsMs.length < 4) return false;
  const outliers = intervalsMs.filter((v) => Math.abs(v - mid) > 0.2 * mid).length;
  return outliers / intervalsMs.length > 0.2;
}
