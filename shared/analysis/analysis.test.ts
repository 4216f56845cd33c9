import { AnalysisError, analysePcm, analyseWav, decodeWav, encodeWav16, traceForDisplay } from './index';
import { gaussianRandom, seededRandom, syntheticBeatTrain } from './synthetic';

const codes = (reasons: { code: string }[]) => reasons.map((r) => r.code);

// Quality thresholds are our own (common practice, no source); these checks hold the verdict to its reasons.
describe('quality verdict on awkward clips', () => {
  test('when the clip lasts 1 s, then the verdict is retake because it is too short', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 70, durationS: 1, sampleRate: 4000 });
    const result = analysePcm(samples, 4000);
    expect(result.quality.verdict).toBe('retake');
    expect(codes(result.quality.reasons)).toContain('too_short');
  });
  test('when the clip is silent, then the verdict is retake with no heartbeat found', () => {
    const result = analysePcm(new Float32Array(4000 * 15), 4000);
    expect(result.quality.verdict).toBe('retake');
    expect(codes(result.quality.reasons)).toContain('no_heartbeat');
    expect(result.heartRateBpm).toBeNull();
  });
  test('when the clip is white noise, then the verdict is retake', () => {
    const gauss = gaussianRandom(seededRandom(3));
    const samples = Float32Array.from({ length: 4000 * 20 }, () => 0.1 * gauss());
    const result = analysePcm(samples, 4000);
    expect(result.quality.verdict).toBe('retake');
    expect(codes(result.quality.reasons).some((c) => c === 'no_heartbeat' || c === 'too_noisy')).toBe(true);
  });
  test('when the recording is driven into clipping, then clipped is among the reasons', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 75, durationS: 20, sampleRate: 4000, noise: 0.005 });
    const clipped = samples.map((v) => Math.max(-0.2, Math.min(0.2, v * 3)));
    const result = analysePcm(clipped, 4000);
    expect(codes(result.quality.reasons)).toContain('clipped');
  });
  test('when a clean beat train of 20 s is analysed, then the verdict is good with about one S1 per beat', () => {
    const train = syntheticBeatTrain({ rateBpm: 75, durationS: 20, sampleRate: 4000, noise: 0.005 });
    const result = analysePcm(train.samples, 4000);
    expect(result.quality.verdict).toBe('good');
    const s1 = result.sounds.filter((s) => s.type === 'S1').length;
    expect(Math.abs(s1 - train.s1OnsetsS.length)).toBeLessThanOrEqual(1);
    expect(result.metrics.usableCycles).toBeGreaterThan(15);
  });
  test('when the clip lasts 10 minutes, then it is analysed without hanging and the rate is right', () => {
    const { samples } = syntheticBeatTrain({
      rateBpm: 64,
      durationS: 600,
      sampleRate: 4000,
      noise: 0.01,
      jitter: 0.05,
    });
    const started = Date.now();
    const result = analysePcm(samples, 4000);
    // a generous bound: this guards against a hang, the speed itself is scripts/analysis/bench.ts's business
    expect(Date.now() - started).toBeLessThan(60000);
    expect(Math.abs((result.heartRateBpm ?? 0) - 64)).toBeLessThan(2);
  });
});

describe('bad samples', () => {
  const code = (fn: () => unknown) => {
    try {
      fn();
    } catch (error) {
      return error instanceof AnalysisError ? error.code : 'other';
    }
    return 'none';
  };
  test('when PCM holds NaN or Infinity, then the code is bad_samples', () => {
    const samples = new Float32Array(8000);
    samples[100] = NaN;
    expect(code(() => analysePcm(samples, 4000))).toBe('bad_samples');
    samples[100] = -Infinity;
    expect(code(() => analysePcm(samples, 4000))).toBe('bad_samples');
  });
  test('when the rate is 0 Hz or absurd, then the code is bad_sample_rate', () => {
    expect(code(() => analysePcm(new Float32Array(100), 0))).toBe('bad_sample_rate');
    expect(code(() => analysePcm(new Float32Array(100), NaN))).toBe('bad_sample_rate');
    expect(code(() => analysePcm(new Float32Array(100), 5e7))).toBe('bad_sample_rate');
  });
  test('when there are no samples, then the code is empty', () => {
    expect(code(() => analysePcm(new Float32Array(0), 4000))).toBe('empty');
  });
});

describe('fuzzing the WAV path', () => {
  test('when random and mutated bytes are fed for a few seconds, then every call returns a result or an AnalysisError', () => {
    const random = seededRandom(12345);
    const { samples } = syntheticBeatTrain({ rateBpm: 80, durationS: 3, sampleRate: 2000 });
    const valid = encodeWav16(samples, 2000);
    const deadline = Date.now() + 3000;
    let runs = 0;
    while (Date.now() < deadline) {
      let bytes: Uint8Array;
      const kind = runs % 3;
      if (kind === 0)
        bytes = Uint8Array.from({ length: Math.floor(random() * 200) }, () => Math.floor(random() * 256));
      else {
        bytes = valid.slice(0, kind === 1 ? valid.length : Math.floor(random() * valid.length));
        const flips = 1 + Math.floor(random() * 8);
        for (let i = 0; i < flips && bytes.length; i++)
          bytes[Math.floor(random() * Math.min(bytes.length, 64))] = Math.floor(random() * 256);
      }
      try {
        const result = analyseWav(bytes);
        expect(['good', 'usable', 'retake']).toContain(result.quality.verdict);
      } catch (error) {
        expect(error).toBeInstanceOf(AnalysisError);
      }
      runs++;
    }
    expect(runs).toBeGreaterThan(20);
  });
});

describe('traceForDisplay', () => {
  test('when asked for 200 points, then min never exceeds max and the duration is the clip length', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 70, durationS: 5, sampleRate: 4000 });
    const trace = traceForDisplay(samples, 4000, 200);
    expect(trace.durationS).toBeCloseTo(5, 6);
    expect(trace.min.length).toBe(200);
    for (let i = 0; i < 200; i++) expect(trace.min[i]).toBeLessThanOrEqual(trace.max[i]);
    expect(Math.max(...trace.max)).toBeGreaterThan(0.1);
  });
  test('when the signal is a 2 Hz drift, then the band-pass removes it from the trace', () => {
    const drift = Float32Array.from({ length: 8000 }, (_, i) => 0.5 * Math.sin((2 * Math.PI * 2 * i) / 4000));
    const trace = traceForDisplay(drift, 4000, 50);
    expect(Math.max(...trace.max.slice(5, 45))).toBeLessThan(0.02);
  });
});

describe('analyseWav', () => {
  test('when given a stereo-free 16-bit file, then the sample rate reported is the input rate', () => {
    const { samples } = syntheticBeatTrain({ rateBpm: 90, durationS: 10, sampleRate: 8000 });
    const result = analyseWav(encodeWav16(samples, 8000));
    expect(result.sampleRate).toBe(8000);
    expect(result.durationS).toBeCloseTo(decodeWav(encodeWav16(samples, 8000)).samples.length / 8000, 9);
  });
});
