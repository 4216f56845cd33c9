/**
 * Friction-spike removal after Schmidt et al., "Segmentation of heart sound recordings by a
 * duration-dependent hidden Markov model", Physiol. Meas. 2010: split into 500 ms windows; while a window's
 * maximum absolute amplitude exceeds three times the median of those maxima, silence the loudest spike in it
 * between the zero crossings around it.
 */
export function removeSpikes(signal: Float64Array, sampleRate: number): Float64Array {
  const out = Float64Array.from(signal);
  const windowSize = Math.max(1, Math.round(sampleRate / 2));
  const windows = Math.floor(out.length / windowSize);
  if (windows < 2) return out;
  const maxima = new Float64Array(windows);
  const windowMax = (w: number) => {
    let m = 0;
    for (let i = w * windowSize, end = i + windowSize; i < end; i++) m = Math.max(m, Math.abs(out[i]));
    return m;
  };
  for (let w = 0; w < windows; w++) maxima[w] = windowMax(w);
  const median = (() => {
    const sorted = Float64Array.from(maxima).sort();
    const mid = sorted.length >> 1;
    return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
  })();
  const threshold = 3 * median;
  // each pass silences at least one sample, but a bound keeps pathological input from taking long
  const maxPasses = windows * 20;
  for (let pass = 0; pass < maxPasses; pass++) {
    let worst = 0;
    for (let w = 1; w < windows; w++) if (maxima[w] > maxima[worst]) worst = w;
    if (!(maxima[worst] > threshold) || threshold === 0) break;
    const start = worst * windowSize;
    let peak = start;
    for (let i = start; i < start + windowSize; i++) if (Math.abs(out[i]) > Math.abs(out[peak])) peak = i;
    let spikeStart = start;
    for (let i = peak - 1; i >= start; i--) {
      if (crossesZero(out[i], out[i + 1])) {
        spikeStart = i;
        break;
      }
    }
    let spikeEnd = start + windowSize - 1;
    for (let i = peak; i < start + windowSize - 1; i++) {
      if (crossesZero(out[i], out[i + 1])) {
        spikeEnd = i;
        break;
      }
    }
    for (let i = spikeStart; i <= spikeEnd; i++) out[i] = 0.0001;
    maxima[worst] = windowMax(worst);
  }
  return out;
}

function crossesZero(a: number, b: number): boolean {
  return Math.sign(a) * Math.sign(b) < 0;
}
