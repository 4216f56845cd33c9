import type { TransferFunction } from './butterworth';

/** Direct form II transposed, as scipy.signal.lfilter; `state` is updated in place. */
export function lfilter(
  b: Float64Array,
  a: Float64Array,
  x: ArrayLike<number>,
  state?: Float64Array,
): Float64Array {
  const order = Math.max(a.length, b.length);
  const bn = new Float64Array(order);
  const an = new Float64Array(order);
  for (let i = 0; i < b.length; i++) bn[i] = b[i] / a[0];
  for (let i = 0; i < a.length; i++) an[i] = a[i] / a[0];
  const z = state ?? new Float64Array(order - 1);
  const y = new Float64Array(x.length);
  const last = order - 1;
  for (let n = 0; n < x.length; n++) {
    const xn = x[n];
    const yn = bn[0] * xn + (last > 0 ? z[0] : 0);
    for (let i = 0; i < last - 1; i++) z[i] = bn[i + 1] * xn + z[i + 1] - an[i + 1] * yn;
    if (last > 0) z[last - 1] = bn[last] * xn - an[last] * yn;
    y[n] = yn;
  }
  return y;
}

/** Steady-state initial conditions for a step input, as scipy.signal.lfilter_zi. */
export function lfilterZi(b: Float64Array, a: Float64Array): Float64Array {
  const order = Math.max(a.length, b.length);
  const bn = new Float64Array(order);
  const an = new Float64Array(order);
  for (let i = 0; i < b.length; i++) bn[i] = b[i] / a[0];
  for (let i = 0; i < a.length; i++) an[i] = a[i] / a[0];
  const n = order - 1;
  if (n === 0) return new Float64Array(0);
  // (I - A^T) zi = B, with A the companion matrix of a
  const matrix: number[][] = [];
  for (let row = 0; row < n; row++) {
    const line = new Array<number>(n).fill(0);
    line[row] = 1;
    matrix.push(line);
  }
  for (let row = 0; row < n; row++) matrix[row][0] += an[row + 1];
  for (let row = 0; row < n - 1; row++) matrix[row][row + 1] -= 1;
  const rhs = Array.from({ length: n }, (_, i) => bn[i + 1] - an[i + 1] * bn[0]);
  return solve(matrix, rhs);
}

function solve(matrix: number[][], rhs: number[]): Float64Array {
  const n = rhs.length;
  const m = matrix.map((row, i) => [...row, rhs[i]]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let row = col + 1; row < n; row++) if (Math.abs(m[row][col]) > Math.abs(m[pivot][col])) pivot = row;
    [m[col], m[pivot]] = [m[pivot], m[col]];
    for (let row = col + 1; row < n; row++) {
      const factor = m[row][col] / m[col][col];
      for (let k = col; k <= n; k++) m[row][k] -= factor * m[col][k];
    }
  }
  const x = new Float64Array(n);
  for (let row = n - 1; row >= 0; row--) {
    let sum = m[row][n];
    for (let k = row + 1; k < n; k++) sum -= m[row][k] * x[k];
    x[row] = sum / m[row][row];
  }
  return x;
}

/**
 * Zero-phase filtering, as scipy.signal.filtfilt with its defaults (odd extension, padlen = 3·max(len a, len b)).
 * Shorter signals get a shorter pad instead of an error.
 */
export function filtfilt({ b, a }: TransferFunction, x: ArrayLike<number>): Float64Array {
  const n = x.length;
  if (n === 0) return new Float64Array(0);
  const padlen = Math.min(3 * Math.max(a.length, b.length), n - 1);
  const extended = new Float64Array(n + 2 * padlen);
  const first = x[0];
  const last = x[n - 1];
  for (let i = 0; i < padlen; i++) {
    extended[i] = 2 * first - x[padlen - i];
    extended[n + padlen + i] = 2 * last - x[n - 2 - i];
  }
  for (let i = 0; i < n; i++) extended[padlen + i] = x[i];

  const zi = lfilterZi(b, a);
  const forwardState = zi.map((z) => z * extended[0]);
  const forward = lfilter(b, a, extended, forwardState);
  forward.reverse();
  const backwardState = zi.map((z) => z * forward[0]);
  const backward = lfilter(b, a, forward, backwardState);
  backward.reverse();
  return backward.slice(padlen, padlen + n);
}
