import { bandPowerEnvelope, blockMean, hilbertEnvelope, homomorphicEnvelope, standardise } from './envelopes';

export const FRAME_RATE = 50;

export const FEATURE_NAMES = [
  'homomorphic',
  'hilbert',
  'logHomomorphic',
  'band40to60',
  'band150to250',
] as const;

export interface FrameFeatures {
  frameRate: number;
  frames: number;
  /** One standardised series per entry of FEATURE_NAMES. */
  series: Float64Array[];
  /** Homomorphic envelope at the frame rate before standardising (for the rate estimate). */
  homomorphic: Float64Array;
}

function logStandardised(x: Float64Array): Float64Array {
  let peak = 0;
  for (const v of x) peak = Math.max(peak, v);
  const floor = peak * 1e-4 + 1e-12;
  return standardise(x.map((v) => Math.log(v + floor)));
}

/** Envelope features of a band-passed signal, one value per 1/FRAME_RATE s (Springer et al. 2016, section II). */
export function frameFeatures(signal: Float64Array, sampleRate: number): FrameFeatures {
  const hop = Math.round(sampleRate / FRAME_RATE);
  const hilbertEnv = hilbertEnvelope(signal);
  const homomorphicFull = homomorphicEnvelope(hilbertEnv, sampleRate);
  const homomorphic = blockMean(homomorphicFull, hop);
  const hilbertFrames = blockMean(hilbertEnv, hop);
  const windowLength = Math.round(0.04 * sampleRate);
  const low = bandPowerEnvelope(signal, sampleRate, hop, windowLength, [40, 50, 60]);
  const high = bandPowerEnvelope(signal, sampleRate, hop, windowLength, [150, 200, 250]);
  const frames = homomorphic.length;
  return {
    frameRate: sampleRate / hop,
    frames,
    homomorphic,
    series: [
      standardise(homomorphic),
      standardise(hilbertFrames),
      logStandardised(homomorphic),
      logStandardised(low.subarray(0, frames)),
      logStandardised(high.subarray(0, frames)),
    ],
  };
}
