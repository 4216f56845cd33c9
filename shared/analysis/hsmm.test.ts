import { stateDurations, viterbiSegment, STATE_COUNT, type DurationParameters } from './hsmm';
import { removeSpikes } from './spikes';

const params: DurationParameters = {
  s1MeanS: 0.12,
  s1StdS: 0.02,
  s2MeanS: 0.1,
  s2StdS: 0.02,
  systoleStdS: 0.02,
  diastoleStdSlope: 0.05,
  diastoleStdOffsetS: 0.02,
};

/** Emissions that favour the true state by `margin` (log units), for a known state sequence. */
function emissionsFor(truth: number[], margin: number): Float64Array[] {
  return Array.from({ length: STATE_COUNT }, (_, s) =>
    Float64Array.from(truth, (t) => (t === s ? 0 : -margin)),
  );
}

function sequence(runs: [number, number][]): number[] {
  return runs.flatMap(([state, length]) => new Array<number>(length).fill(state));
}

describe('hidden semi-Markov segmentation', () => {
  // The expected behaviour is the definition of the model (Springer et al., IEEE TBME 2016): cyclic
  // S1 → systole → S2 → diastole with Gaussian durations; with clear emissions the decoded path is the truth.
  test('when emissions clearly mark each state, then the decoded sequence is the true one, edges included', () => {
    const cycle: [number, number][] = [
      [0, 6],
      [1, 10],
      [2, 5],
      [3, 19],
    ];
    const truth = sequence([[3, 7], ...cycle, ...cycle, ...cycle, [0, 6], [1, 4]]);
    const durations = stateDurations(params, 0.8, 0.32, 50);
    const { states } = viterbiSegment(emissionsFor(truth, 3), durations);
    expect(Array.from(states)).toEqual(truth);
  });

  test('when the emissions are flat, then the durations alone give a regular cycle at the estimated rate', () => {
    const frames = 400;
    const flat = Array.from({ length: STATE_COUNT }, () => new Float64Array(frames));
    const { states } = viterbiSegment(flat, stateDurations(params, 0.6, 0.25, 50));
    const s1Starts: number[] = [];
    for (let t = 1; t < frames; t++) if (states[t] === 0 && states[t - 1] !== 0) s1Starts.push(t);
    const gaps = s1Starts.slice(1).map((t, i) => t - s1Starts[i]);
    expect(gaps.length).toBeGreaterThan(10);
    for (const gap of gaps) expect(Math.abs(gap - 30)).toBeLessThanOrEqual(1);
  });

  test('when the state order is violated by the emissions, then the path still follows S1 → systole → S2 → diastole', () => {
    const noisy = sequence([
      [0, 6],
      [2, 5],
      [1, 10],
      [3, 19],
      [0, 6],
      [1, 10],
      [2, 5],
      [3, 19],
    ]);
    const { states } = viterbiSegment(emissionsFor(noisy, 1), stateDurations(params, 0.8, 0.32, 50));
    for (let t = 1; t < states.length; t++) {
      if (states[t] !== states[t - 1]) expect(states[t]).toBe((states[t - 1] + 1) % STATE_COUNT);
    }
  });
});

// Rule of Schmidt et al., Physiol. Meas. 2010 (as used by Springer et al. 2016): windows of 500 ms whose
// maximum exceeds three times the median window maximum have their spike set to zero between zero crossings.
describe('spike removal', () => {
  test('when one window holds a spike ten times the typical level, then it is silenced and the rest is untouched', () => {
    const rate = 1000;
    const signal = Float64Array.from(
      { length: 5000 },
      (_, i) => 0.1 * Math.sin((2 * Math.PI * 30 * i) / rate),
    );
    for (let i = 2200; i < 2205; i++) signal[i] = 1;
    const cleaned = removeSpikes(signal, rate);
    expect(Math.max(...Array.from(cleaned.subarray(2000, 2500), Math.abs))).toBeLessThanOrEqual(0.1 + 1e-9);
    expect(Array.from(cleaned.subarray(0, 2000))).toEqual(Array.from(signal.subarray(0, 2000)));
  });
  test('when no window stands out, then the signal is unchanged', () => {
    const signal = Float64Array.from({ length: 3000 }, (_, i) => Math.sin(i / 7));
    expect(Array.from(removeSpikes(signal, 1000))).toEqual(Array.from(signal));
  });
});
