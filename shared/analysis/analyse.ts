import { AnalysisError } from './errors';
import { frameFeatures } from './features';
import { STATE_S1, STATE_S2, type HsmmModel } from './hsmm';
import { measure, toHeartSounds, type SoundSpan } from './measurements';
import modelJson from './model/hsmm-model.json';
import {
  committedModel as murmurModel,
  murmurFeatures,
  screenMurmur,
  type MurmurFeatures,
  type MurmurModel,
} from './murmur';
import { preprocess } from './preprocess';
import { rateEvidence, type RateEvidence } from './rate-check';
import { assessQuality, clippedFraction } from './quality';
import { segmentFrames, stateRuns } from './segmentation';
import type { AnalysisOptions, AnalysisResult, Metrics } from './types';
import { checkSampleRate, decodeWav, MAX_DURATION_S } from './wav';

export const ANALYSIS_VERSION = `1.4.0+model.${(modelJson as HsmmModel).version}+murmur.${murmurModel.version}`;

/** Below this the segmentation has too little to work with; the verdict says so. */
const MIN_ANALYSED_S = 2;

export interface InternalOptions extends AnalysisOptions {
  /** A model other than the committed one (cross-validation). */
  model?: HsmmModel;
  /** A murmur model other than the committed one (cross-validation). */
  murmurModel?: MurmurModel;
}

function emptyMetrics(): Metrics {
  return {
    heartRateBpm: null,
    sdnnMs: null,
    rmssdMs: null,
    pnn50: null,
    irregularRhythm: false,
    s1DurationMs: null,
    s2DurationMs: null,
    systoleMs: null,
    diastoleMs: null,
    systoleDiastoleRatio: null,
    s1s2PeakRatio: null,
    s1s2EnergyRatio: null,
    systolicActivity: null,
    diastolicActivity: null,
    usableCycles: 0,
    beats: [],
  };
}

function checkSamples(samples: Float32Array, sampleRate: number): void {
  checkSampleRate(sampleRate);
  if (samples.length === 0) throw new AnalysisError('empty', 'There are no samples to analyse.');
  if (samples.length / sampleRate > MAX_DURATION_S) {
    throw new AnalysisError('too_long', `The clip lasts over ${MAX_DURATION_S} s.`);
  }
  for (let i = 0; i < samples.length; i++) {
    if (!Number.isFinite(samples[i]))
      throw new AnalysisError('bad_samples', `Sample ${i} is not a finite number (NaN or Infinity).`);
  }
}

export function analysePcm(
  samples: Float32Array,
  sampleRate: number,
  options: InternalOptions = {},
): AnalysisResult {
  return analyseInDetail(samples, sampleRate, options).result;
}

/** The analysis and the murmur features its screen was drawn from (fit-murmur.ts caches them per recording). */
export function analyseInDetail(
  samples: Float32Array,
  sampleRate: number,
  options: InternalOptions = {},
): { result: AnalysisResult; murmurFeatures: MurmurFeatures | null } {
  checkSamples(samples, sampleRate);
  const model = options.model ?? (modelJson as HsmmModel);
  const durationS = samples.length / sampleRate;
  const clipped = clippedFraction(samples);
  let metrics = emptyMetrics();
  let sounds: AnalysisResult['sounds'] = [];
  let level = 0;
  let periodicity: number | null = null;
  let evidence: RateEvidence | null = null;
  let murmur: MurmurFeatures | null = null;

  if (durationS >= MIN_ANALYSED_S) {
    const working = preprocess(samples, sampleRate);
    const { signal } = working;
    for (let i = 0; i < signal.length; i++) level += signal[i] * signal[i];
    level = Math.sqrt(level / Math.max(1, signal.length));
    if (level > 0) {
      const features = frameFeatures(signal, working.sampleRate);
      const segmentation = segmentFrames(features, model);
      periodicity = segmentation.rate?.periodicity ?? null;
      if (segmentation.rate) {
        const samplesPerFrame = working.sampleRate / features.frameRate;
        const spans: SoundSpan[] = stateRuns(segmentation.states)
          .filter((run) => run.state === STATE_S1 || run.state === STATE_S2)
          .map((run) => ({
            type: run.state === STATE_S1 ? 'S1' : 'S2',
            start: Math.round(run.start * samplesPerFrame),
            end: Math.round(run.end * samplesPerFrame),
          }));
        metrics = measure(signal, working.sampleRate, spans);
        sounds = toHeartSounds(signal, working.sampleRate, spans);
        evidence = rateEvidence(features.homomorphic, features.frameRate, metrics);
        murmur = murmurFeatures(signal, working.sampleRate, spans);
      }
    }
  }

  const quality = assessQuality({
    durationS,
    clippedFraction: clipped,
    level,
    periodicity,
    metrics,
    rateEvidence: evidence,
  });
  const result: AnalysisResult = {
    sampleRate,
    durationS,
    heartRateBpm: metrics.heartRateBpm,
    sounds,
    metrics,
    quality,
    screen: screenMurmur(murmur, quality, options.murmurModel ?? murmurModel),
    analysisVersion: ANALYSIS_VERSION,
  };
  return { result, murmurFeatures: murmur };
}

export function analyseWav(bytes: Uint8Array, options: InternalOptions = {}): AnalysisResult {
  const { samples, sampleRate } = decodeWav(bytes);
  return analysePcm(samples, sampleRate, options);
}
