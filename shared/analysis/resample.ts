/** Polyphase resampling with the filter and alignment of scipy.signal.resample_poly (Kaiser β = 5). */

function besselI0(x: number): number {
  let sum = 1;
  let term = 1;
  const quarter = (x * x) / 4;
  for (let k = 1; k < 500; k++) {
    term *= quarter / (k * k);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return sum;
}

function sinc(x: number): number {
  if (x === 0) return 1;
  const y = Math.PI * x;
  return Math.sin(y) / y;
}

/** scipy.signal.firwin(numtaps, cutoff, window=('kaiser', beta)) with cutoff relative to Nyquist. */
export function firwinKaiser(numtaps: number, cutoff: number, beta: number): Float64Array {
  const alpha = (numtaps - 1) / 2;
  const h = new Float64Array(numtaps);
  const norm = besselI0(beta);
  let sum = 0;
  for (let n = 0; n < numtaps; n++) {
    const m = n - alpha;
    const ratio = numtaps === 1 ? 0 : (2 * n) / (numtaps - 1) - 1;
    const window = besselI0(beta * Math.sqrt(Math.max(0, 1 - ratio * ratio))) / norm;
    h[n] = cutoff * sinc(cutoff * m) * window;
    sum += h[n];
  }
  for (let n = 0; n < numtaps; n++) h[n] /= sum;
  return h;
}

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

const filterCache = new Map<string, Float64Array>();

function designFilter(up: number, down: number): Float64Array {
  const key = `${up}/${down}`;
  let h = filterCache.get(key);
  if (!h) {
    const maxRate = Math.max(up, down);
    const halfLen = 10 * maxRate;
    h = firwinKaiser(2 * halfLen + 1, 1 / maxRate, 5.0).map((v) => v * up);
    if (filterCache.size > 8) filterCache.clear();
    filterCache.set(key, h);
  }
  return h;
}

export function resamplePoly(input: ArrayLike<number>, up: number, down: number): Float64Array {
  const g = gcd(up, down);
  up /= g;
  down /= g;
  const x = input instanceof Float64Array ? input : Float64Array.from(input);
  const nIn = x.length;
  if (up === 1 && down === 1) return Float64Array.from(x);
  const nOut = Math.ceil((nIn * up) / down);
  const h = designFilter(up, down);
  const halfLen = (h.length - 1) / 2;
  const y = new Float64Array(nOut);
  for (let k = 0; k < nOut; k++) {
    const centre = k * down + halfLen;
    const first = Math.max(0, Math.ceil((centre - 2 * halfLen) / up));
    const last = Math.min(nIn - 1, Math.floor(centre / up));
    // four running sums keep the multiply-adds independent (the loop is latency-bound otherwise)
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let i = first;
    let tap = centre - first * up;
    const up4 = 4 * up;
    for (; i + 3 <= last; i += 4, tap -= up4) {
      s0 += x[i] * h[tap];
      s1 += x[i + 1] * h[tap - up];
      s2 += x[i + 2] * h[tap - 2 * up];
      s3 += x[i + 3] * h[tap - 3 * up];
    }
    for (; i <= last; i++, tap -= up) s0 += x[i] * h[tap];
    y[k] = s0 + s1 + s2 + s3;
  }
  return y;
}

/** The up/down pair used to go from one rate to another, approximated when the exact ratio would need a huge filter. */
export function resampleRatio(fromRate: number, toRate: number): { up: number; down: number } {
  const from = Math.round(fromRate);
  const to = Math.round(toRate);
  const g = gcd(from, to);
  let up = to / g;
  let down = from / g;
  const limit = 2000;
  if (Math.max(up, down) > limit) {
    // best rational approximation of to/from with denominators up to the limit (continued fractions)
    const target = to / from;
    let bestUp = Math.max(1, Math.round(target));
    let bestDown = 1;
    let [h0, h1, k0, k1] = [0, 1, 1, 0];
    let value = target;
    for (let i = 0; i < 40; i++) {
      const a = Math.floor(value);
      [h0, h1] = [h1, a * h1 + h0];
      [k0, k1] = [k1, a * k1 + k0];
      if (Math.max(h1, k1) > limit) break;
      bestUp = h1;
      bestDown = k1;
      const fraction = value - a;
      if (fraction < 1e-12) break;
      value = 1 / fraction;
    }
    up = bestUp;
    down = bestDown;
  }
  return { up, down };
}
