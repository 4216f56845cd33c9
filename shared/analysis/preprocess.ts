import { butter, type TransferFunction } from './butterworth';
import { filtfilt } from './filtfilt';
import { resamplePoly, resampleRatio } from './resample';
import { removeSpikes } from './spikes';

export const WORKING_RATE = 1000;
export const BAND_LOW_HZ = 25;
export const BAND_HIGH_HZ = 400;

export interface WorkingSignal {
  /** Band-passed, spike-free signal at `sampleRate`. */
  signal: Float64Array;
  sampleRate: number;
}

const filters = new Map<number, { low: TransferFunction; high: TransferFunction }>();

function bandFilters(sampleRate: number) {
  let pair = filters.get(sampleRate);
  if (!pair) {
    pair = {
      low: butter(2, BAND_HIGH_HZ, sampleRate, 'lowpass'),
      high: butter(2, BAND_LOW_HZ, sampleRate, 'highpass'),
    };
    if (filters.size > 8) filters.clear();
    filters.set(sampleRate, pair);
  }
  return pair;
}

export function toWorkingRate(
  samples: ArrayLike<number>,
  sampleRate: number,
  targetRate = WORKING_RATE,
): WorkingSignal {
  const { up, down } = resampleRatio(sampleRate, targetRate);
  return { signal: resamplePoly(samples, up, down), sampleRate: (sampleRate * up) / down };
}

/** Second-order low-pass at 400 Hz then second-order high-pass at 25 Hz, each run forwards and backwards. */
export function bandPass(signal: Float64Array, sampleRate: number): Float64Array {
  const { low, high } = bandFilters(sampleRate);
  return filtfilt(high, filtfilt(low, signal));
}

export function preprocess(samples: ArrayLike<number>, sampleRate: number): WorkingSignal {
  const working = toWorkingRate(samples, sampleRate);
  const filtered = bandPass(working.signal, working.sampleRate);
  return { signal: removeSpikes(filtered, working.sampleRate), sampleRate: working.sampleRate };
}
