/** Digital Butterworth design, the same steps as scipy.signal.butter(output='ba'). */

export type FilterKind = 'lowpass' | 'highpass' | 'bandpass';

export interface TransferFunction {
  b: Float64Array;
  a: Float64Array;
}

interface Complex {
  re: number;
  im: number;
}

const c = (re: number, im = 0): Complex => ({ re, im });
const add = (x: Complex, y: Complex): Complex => c(x.re + y.re, x.im + y.im);
const sub = (x: Complex, y: Complex): Complex => c(x.re - y.re, x.im - y.im);
const mul = (x: Complex, y: Complex): Complex => c(x.re * y.re - x.im * y.im, x.re * y.im + x.im * y.re);
const div = (x: Complex, y: Complex): Complex => {
  const d = y.re * y.re + y.im * y.im;
  return c((x.re * y.re + x.im * y.im) / d, (x.im * y.re - x.re * y.im) / d);
};
const sqrtC = (x: Complex): Complex => {
  const r = Math.hypot(x.re, x.im);
  const re = Math.sqrt((r + x.re) / 2);
  const im = Math.sign(x.im || 1) * Math.sqrt(Math.max(0, (r - x.re) / 2));
  return c(re, x.im === 0 && x.re >= 0 ? 0 : im);
};
const product = (values: Complex[]): Complex => values.reduce(mul, c(1));

function poly(roots: Complex[]): Float64Array {
  let coefficients: Complex[] = [c(1)];
  for (const root of roots) {
    const next: Complex[] = new Array(coefficients.length + 1).fill(null).map(() => c(0));
    for (let i = 0; i < coefficients.length; i++) {
      next[i] = add(next[i], coefficients[i]);
      next[i + 1] = sub(next[i + 1], mul(coefficients[i], root));
    }
    coefficients = next;
  }
  return Float64Array.from(coefficients, (x) => x.re);
}

/**
 * @param order filter order (a band-pass doubles it, as in scipy)
 * @param cutoffHz one corner, or [low, high] for a band-pass
 */
export function butter(
  order: number,
  cutoffHz: number | [number, number],
  sampleRate: number,
  kind: FilterKind,
): TransferFunction {
  const nyquist = sampleRate / 2;
  const corners = (Array.isArray(cutoffHz) ? cutoffHz : [cutoffHz]).map((f) => f / nyquist);
  if (corners.some((w) => !(w > 0 && w < 1)))
    throw new RangeError('Cut-off frequencies must lie between 0 and Nyquist.');
  const fs = 2;
  const warped = corners.map((w) => 2 * fs * Math.tan((Math.PI * w) / fs));

  let zeros: Complex[] = [];
  let poles: Complex[] = [];
  for (let m = -order + 1; m < order; m += 2) {
    const angle = (Math.PI * m) / (2 * order);
    poles.push(c(-Math.cos(angle), -Math.sin(angle)));
  }
  let gain = 1;

  if (kind === 'lowpass') {
    const wo = warped[0];
    poles = poles.map((p) => c(p.re * wo, p.im * wo));
    gain *= wo ** poles.length;
  } else if (kind === 'highpass') {
    const wo = warped[0];
    const degree = poles.length - zeros.length;
    gain *= div(product(zeros.map((z) => c(-z.re, -z.im))), product(poles.map((p) => c(-p.re, -p.im)))).re;
    zeros = zeros.map((z) => div(c(wo), z));
    poles = poles.map((p) => div(c(wo), p));
    for (let i = 0; i < degree; i++) zeros.push(c(0));
  } else {
    const [w1, w2] = warped;
    const bw = w2 - w1;
    const wo = Math.sqrt(w1 * w2);
    const degree = poles.length - zeros.length;
    const transform = (roots: Complex[]) =>
      roots.flatMap((r) => {
        const scaled = c((r.re * bw) / 2, (r.im * bw) / 2);
        const root = sqrtC(sub(mul(scaled, scaled), c(wo * wo)));
        return [add(scaled, root), sub(scaled, root)];
      });
    zeros = transform(zeros);
    poles = transform(poles);
    for (let i = 0; i < degree; i++) zeros.push(c(0));
    gain *= bw ** degree;
  }

  const fs2 = c(2 * fs);
  const degree = poles.length - zeros.length;
  gain *= div(product(zeros.map((z) => sub(fs2, z))), product(poles.map((p) => sub(fs2, p)))).re;
  const digitalZeros = zeros.map((z) => div(add(fs2, z), sub(fs2, z)));
  const digitalPoles = poles.map((p) => div(add(fs2, p), sub(fs2, p)));
  for (let i = 0; i < degree; i++) digitalZeros.push(c(-1));

  const b = poly(digitalZeros).map((x) => x * gain);
  const a = poly(digitalPoles);
  return { b, a };
}
