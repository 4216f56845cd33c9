import { butter } from './butterworth';
import { fft, nextPowerOfTwo } from './fft';
import { filtfilt } from './filtfilt';

/** Analytic signal, as scipy.signal.hilbert(x, n); `n` defaults to the input length. */
export function hilbert(x: ArrayLike<number>, n = x.length): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let i = 0; i < Math.min(n, x.length); i++) re[i] = x[i];
  fft(re, im);
  const half = n >> 1;
  if (n % 2 === 0) {
    for (let k = 1; k < half; k++) {
      re[k] *= 2;
      im[k] *= 2;
    }
    for (let k = half + 1; k < n; k++) re[k] = im[k] = 0;
  } else {
    for (let k = 1; k <= half; k++) {
      re[k] *= 2;
      im[k] *= 2;
    }
    for (let k = half + 1; k < n; k++) re[k] = im[k] = 0;
  }
  fft(re, im, true);
  return { re, im };
}

/**
 * Imaginary part of scipy.signal.hilbert(x, n) for even n, through two half-length complex transforms
 * (the real part is x itself): forward real FFT, multiply by −i·sign(k), inverse real FFT.
 */
export function hilbertTransform(x: ArrayLike<number>, n: number): Float64Array {
  const m = n / 2;
  const re = new Float64Array(m);
  const im = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    re[j] = 2 * j < x.length ? x[2 * j] : 0;
    im[j] = 2 * j + 1 < x.length ? x[2 * j + 1] : 0;
  }
  fft(re, im);
  // Y[k] = -i·X[k] for 0 < k < m, 0 at k = 0 and k = m; X[k] unpacked from the half-length transform
  const yRe = new Float64Array(m + 1);
  const yIm = new Float64Array(m + 1);
  for (let k = 1; k < m; k++) {
    const zr = re[k];
    const zi = im[k];
    const cr = re[m - k];
    const ci = -im[m - k];
    const er = (zr + cr) / 2;
    const ei = (zi + ci) / 2;
    // (Z − conj Z')/(2i)
    const or = (zi - ci) / 2;
    const oi = -(zr - cr) / 2;
    const angle = (-2 * Math.PI * k) / n;
    const wr = Math.cos(angle);
    const wi = Math.sin(angle);
    const xr = er + wr * or - wi * oi;
    const xi = ei + wr * oi + wi * or;
    yRe[k] = xi;
    yIm[k] = -xr;
  }
  // inverse: E = (Y[k] + conj Y[m−k]) / 2, O = (Y[k] − conj Y[m−k]) · W^−k / 2, Z = E + i·O
  for (let k = 0; k < m; k++) {
    const ar = yRe[k];
    const ai = yIm[k];
    const br = yRe[m - k];
    const bi = -yIm[m - k];
    const er = (ar + br) / 2;
    const ei = (ai + bi) / 2;
    const dr = (ar - br) / 2;
    const di = (ai - bi) / 2;
    const angle = (2 * Math.PI * k) / n;
    const wr = Math.cos(angle);
    const wi = Math.sin(angle);
    const or = dr * wr - di * wi;
    const oi = dr * wi + di * wr;
    re[k] = er - oi;
    im[k] = ei + or;
  }
  fft(re, im, true);
  const y = new Float64Array(n);
  for (let j = 0; j < m; j++) {
    y[2 * j] = re[j];
    y[2 * j + 1] = im[j];
  }
  return y;
}

/** |analytic signal|; padded to a power of two for speed, as abs(scipy.signal.hilbert(x, N)) cut to the input length. */
export function hilbertEnvelope(
  x: ArrayLike<number>,
  fftLength = Math.max(2, nextPowerOfTwo(x.length)),
): Float64Array {
  const out = new Float64Array(x.length);
  if (fftLength % 2 === 1) {
    const { re, im } = hilbert(x, fftLength);
    for (let i = 0; i < x.length; i++) out[i] = Math.hypot(re[i], im[i]);
    return out;
  }
  const y = hilbertTransform(x, fftLength);
  for (let i = 0; i < x.length; i++) out[i] = Math.sqrt(x[i] * x[i] + y[i] * y[i]);
  return out;
}

const LOG_FLOOR = 1e-12;

/** exp(low-pass(log(Hilbert envelope))): first-order Butterworth at 8 Hz, zero phase. */
export function homomorphicEnvelope(
  hilbertEnv: Float64Array,
  sampleRate: number,
  cutoffHz = 8,
): Float64Array {
  const logEnv = new Float64Array(hilbertEnv.length);
  for (let i = 0; i < logEnv.length; i++) logEnv[i] = Math.log(Math.max(hilbertEnv[i], LOG_FLOOR));
  const smoothed = filtfilt(butter(1, cutoffHz, sampleRate, 'lowpass'), logEnv);
  for (let i = 0; i < smoothed.length; i++) smoothed[i] = Math.exp(smoothed[i]);
  return smoothed;
}

/**
 * Mean power between `lowHz` and `highHz` in a Hann window centred on each frame: a band-power envelope
 * at the frame rate (sampleRate / hop).
 */
export function bandPowerEnvelope(
  x: Float64Array,
  sampleRate: number,
  hop: number,
  windowLength: number,
  frequenciesHz: number[],
): Float64Array {
  const frames = Math.floor(x.length / hop);
  const out = new Float64Array(frames);
  const window = new Float64Array(windowLength);
  for (let i = 0; i < windowLength; i++)
    window[i] = 0.5 - 0.5 * Math.cos((2 * Math.PI * (i + 0.5)) / windowLength);
  const cos = frequenciesHz.map((f) =>
    Float64Array.from(window, (w, i) => w * Math.cos((2 * Math.PI * f * i) / sampleRate)),
  );
  const sin = frequenciesHz.map((f) =>
    Float64Array.from(window, (w, i) => w * Math.sin((2 * Math.PI * f * i) / sampleRate)),
  );
  for (let frame = 0; frame < frames; frame++) {
    const start = Math.min(
      Math.max(0, Math.round(frame * hop + hop / 2 - windowLength / 2)),
      Math.max(0, x.length - windowLength),
    );
    let power = 0;
    for (let f = 0; f < frequenciesHz.length; f++) {
      let re = 0;
      let im = 0;
      const cf = cos[f];
      const sf = sin[f];
      for (let i = 0; i < windowLength && start + i < x.length; i++) {
        re += x[start + i] * cf[i];
        im += x[start + i] * sf[i];
      }
      power += re * re + im * im;
    }
    out[frame] = power / frequenciesHz.length;
  }
  return out;
}

/** Block mean: one value per `factor` samples (the envelopes are already low-passed well below the new rate). */
export function blockMean(x: Float64Array, factor: number): Float64Array {
  const frames = Math.floor(x.length / factor);
  const out = new Float64Array(frames);
  for (let frame = 0; frame < frames; frame++) {
    let sum = 0;
    for (let i = frame * factor, end = i + factor; i < end; i++) sum += x[i];
    out[frame] = sum / factor;
  }
  return out;
}

export function standardise(x: Float64Array): Float64Array {
  let mean = 0;
  for (const v of x) mean += v;
  mean /= x.length || 1;
  let variance = 0;
  for (const v of x) variance += (v - mean) ** 2;
  const std = Math.sqrt(variance / (x.length || 1)) || 1;
  return x.map((v) => (v - mean) / std);
}
