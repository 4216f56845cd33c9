/** In-place complex FFT on split arrays; any length (radix-2 directly, Bluestein otherwise). */

const radix2Cache = new Map<number, { cos: Float64Array; sin: Float64Array; reversed: Uint32Array }>();

/** Twiddles laid out stage by stage: the stage with half-size h keeps its h factors at [h, 2h). */
function radix2Tables(n: number) {
  let tables = radix2Cache.get(n);
  if (!tables) {
    const cos = new Float64Array(Math.max(n, 2));
    const sin = new Float64Array(Math.max(n, 2));
    for (let half = 1; half < n; half *= 2) {
      for (let k = 0; k < half; k++) {
        cos[half + k] = Math.cos((Math.PI * k) / half);
        sin[half + k] = Math.sin((Math.PI * k) / half);
      }
    }
    const bits = Math.round(Math.log2(n));
    const reversed = new Uint32Array(n);
    for (let i = 1; i < n; i++) reversed[i] = (reversed[i >> 1] >> 1) | ((i & 1) << (bits - 1));
    tables = { cos, sin, reversed };
    if (radix2Cache.size > 16) radix2Cache.clear();
    radix2Cache.set(n, tables);
  }
  return tables;
}

export function isPowerOfTwo(n: number): boolean {
  return n > 0 && (n & (n - 1)) === 0;
}

export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

function fftRadix2(re: Float64Array, im: Float64Array, inverse: boolean): void {
  const n = re.length;
  if (n <= 1) return;
  const { cos, sin, reversed } = radix2Tables(n);
  for (let i = 0; i < n; i++) {
    const j = reversed[i];
    if (j > i) {
      let t = re[i];
      re[i] = re[j];
      re[j] = t;
      t = im[i];
      im[i] = im[j];
      im[j] = t;
    }
  }
  const sign = inverse ? 1 : -1;
  for (let half = 1; half < n; half *= 2) {
    const size = 2 * half;
    for (let start = 0; start < n; start += size) {
      for (let k = 0; k < half; k++) {
        const wr = cos[half + k];
        const wi = sign * sin[half + k];
        const a = start + k;
        const b = a + half;
        const br = re[b];
        const bi = im[b];
        const tr = br * wr - bi * wi;
        const ti = br * wi + bi * wr;
        re[b] = re[a] - tr;
        im[b] = im[a] - ti;
        re[a] += tr;
        im[a] += ti;
      }
    }
  }
}

function fftBluestein(re: Float64Array, im: Float64Array, inverse: boolean): void {
  const n = re.length;
  const m = nextPowerOfTwo(2 * n - 1);
  const sign = inverse ? 1 : -1;
  const chirpRe = new Float64Array(n);
  const chirpIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // k*k mod 2n keeps the angle exact for long inputs
    const angle = (Math.PI * ((k * k) % (2 * n))) / n;
    chirpRe[k] = Math.cos(angle);
    chirpIm[k] = sign * Math.sin(angle);
  }
  const aRe = new Float64Array(m);
  const aIm = new Float64Array(m);
  for (let k = 0; k < n; k++) {
    aRe[k] = re[k] * chirpRe[k] - im[k] * chirpIm[k];
    aIm[k] = re[k] * chirpIm[k] + im[k] * chirpRe[k];
  }
  const bRe = new Float64Array(m);
  const bIm = new Float64Array(m);
  bRe[0] = chirpRe[0];
  bIm[0] = -chirpIm[0];
  for (let k = 1; k < n; k++) {
    bRe[k] = bRe[m - k] = chirpRe[k];
    bIm[k] = bIm[m - k] = -chirpIm[k];
  }
  fftRadix2(aRe, aIm, false);
  fftRadix2(bRe, bIm, false);
  for (let k = 0; k < m; k++) {
    const r = aRe[k] * bRe[k] - aIm[k] * bIm[k];
    aIm[k] = aRe[k] * bIm[k] + aIm[k] * bRe[k];
    aRe[k] = r;
  }
  fftRadix2(aRe, aIm, true);
  for (let k = 0; k < n; k++) {
    const r = aRe[k] / m;
    const i = aIm[k] / m;
    re[k] = r * chirpRe[k] - i * chirpIm[k];
    im[k] = r * chirpIm[k] + i * chirpRe[k];
  }
}

/** Unnormalised forward transform, or inverse transform scaled by 1/n. */
export function fft(re: Float64Array, im: Float64Array, inverse = false): void {
  const n = re.length;
  if (isPowerOfTwo(n)) fftRadix2(re, im, inverse);
  else if (n > 1) fftBluestein(re, im, inverse);
  if (inverse) {
    for (let i = 0; i < n; i++) {
      re[i] /= n;
      im[i] /= n;
    }
  }
}
