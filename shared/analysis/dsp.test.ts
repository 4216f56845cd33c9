import * as fs from 'fs';
import * as path from 'path';
import { butter, type FilterKind } from './butterworth';
import { hilbert, hilbertEnvelope, homomorphicEnvelope } from './envelopes';
import { filtfilt, lfilterZi } from './filtfilt';
import { firwinKaiser, resamplePoly } from './resample';

interface Reference {
  x: number[];
  odd: number[];
  butter: {
    order: number;
    cutoff: number | [number, number];
    fs: number;
    kind: FilterKind;
    b: number[];
    a: number[];
    zi: number[];
    filtfilt: number[];
  }[];
  resamplePoly: { up: number; down: number; input: number[]; output: number[] }[];
  hilbert: { re: number[]; im: number[] };
  hilbertOdd: { re: number[]; im: number[] };
  hilbertEnvelopePadded1024: number[];
  homomorphicEnvelope: number[];
  firwinKaiser: { numtaps: number; cutoff: number; beta: number; h: number[] };
}

// Reference vectors from scipy.signal (butter, lfilter_zi, filtfilt, resample_poly, firwin, hilbert),
// written by scripts/analysis/reference/make-reference.py.
const reference: Reference = JSON.parse(
  fs.readFileSync(path.join(__dirname, '../../scripts/analysis/reference/scipy-reference.json'), 'utf8'),
);

function maxAbsDifference(actual: ArrayLike<number>, expected: ArrayLike<number>): number {
  expect(actual.length).toBe(expected.length);
  let worst = 0;
  for (let i = 0; i < expected.length; i++) worst = Math.max(worst, Math.abs(actual[i] - expected[i]));
  return worst;
}

describe('Butterworth design and zero-phase filtering', () => {
  for (const design of reference.butter) {
    const label = `${design.kind} order ${design.order} at ${JSON.stringify(design.cutoff)} Hz, fs ${design.fs}`;
    test(`when designing a ${label}, then b and a equal scipy.signal.butter`, () => {
      const { b, a } = butter(design.order, design.cutoff, design.fs, design.kind);
      expect(maxAbsDifference(b, design.b)).toBeLessThan(1e-9);
      expect(maxAbsDifference(a, design.a)).toBeLessThan(1e-9);
    });
    test(`when filtering with a ${label}, then the initial state equals lfilter_zi and the output equals filtfilt`, () => {
      const filter = { b: Float64Array.from(design.b), a: Float64Array.from(design.a) };
      expect(maxAbsDifference(lfilterZi(filter.b, filter.a), design.zi)).toBeLessThan(1e-9);
      expect(maxAbsDifference(filtfilt(filter, reference.x), design.filtfilt)).toBeLessThan(1e-6);
    });
  }
});

describe('Resampling', () => {
  test('when designing the anti-aliasing filter, then it equals scipy.signal.firwin with a Kaiser window', () => {
    const { numtaps, cutoff, beta, h } = reference.firwinKaiser;
    expect(maxAbsDifference(firwinKaiser(numtaps, cutoff, beta), h)).toBeLessThan(1e-12);
  });
  for (const { up, down, input, output } of reference.resamplePoly) {
    test(`when resampling by ${up}/${down}, then the output equals scipy.signal.resample_poly`, () => {
      expect(maxAbsDifference(resamplePoly(input, up, down), output)).toBeLessThan(1e-6);
    });
  }
});

describe('Envelopes', () => {
  test('when taking the analytic signal of an even-length input, then it equals scipy.signal.hilbert', () => {
    const { re, im } = hilbert(reference.x);
    expect(maxAbsDifference(re, reference.hilbert.re)).toBeLessThan(1e-9);
    expect(maxAbsDifference(im, reference.hilbert.im)).toBeLessThan(1e-9);
  });
  test('when taking the analytic signal of an odd-length input, then it equals scipy.signal.hilbert', () => {
    const { re, im } = hilbert(reference.odd);
    expect(maxAbsDifference(re, reference.hilbertOdd.re)).toBeLessThan(1e-9);
    expect(maxAbsDifference(im, reference.hilbertOdd.im)).toBeLessThan(1e-9);
  });
  test('when padding the transform to 1024 points, then the envelope equals abs(scipy.signal.hilbert(x, 1024))', () => {
    const envelope = hilbertEnvelope(reference.x, 1024);
    expect(maxAbsDifference(envelope, reference.hilbertEnvelopePadded1024)).toBeLessThan(1e-9);
  });
  test('when building the homomorphic envelope, then it equals exp(filtfilt(butter(1, 8 Hz), log|hilbert|)) in scipy', () => {
    const envelope = homomorphicEnvelope(hilbertEnvelope(reference.x, 1024), 1000);
    expect(maxAbsDifference(envelope, reference.homomorphicEnvelope)).toBeLessThan(1e-6);
  });
});
