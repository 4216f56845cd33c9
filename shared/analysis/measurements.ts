import type { BeatDetail, HeartSound, Metrics } from './types';
import { isIrregular, median, pnn50, rmssd, sdnn } from './variability';

interface Span {
  start: number;
  end: number;
}

/** A sound as sample indices into the working signal. */
export interface SoundSpan extends Span {
  type: 'S1' | 'S2';
}

/** Energy-weighted centre of a sound: finer than the frame grid its boundaries sit on. */
export function centre(signal: Float64Array, { start, end }: Span): number {
  let weight = 0;
  let moment = 0;
  for (let i = Math.max(0, start); i < Math.min(signal.length, end); i++) {
    const e = signal[i] * signal[i];
    weight += e;
    moment += e * i;
  }
  return weight > 0 ? moment / weight : (start + end) / 2;
}

function rms(signal: Float64Array, { start, end }: Span): number {
  let sum = 0;
  const from = Math.max(0, start);
  const to = Math.min(signal.length, end);
  for (let i = from; i < to; i++) sum += signal[i] * signal[i];
  return to > from ? Math.sqrt(sum / (to - from)) : 0;
}

function energy(signal: Float64Array, { start, end }: Span): number {
  let sum = 0;
  for (let i = Math.max(0, start); i < Math.min(signal.length, end); i++) sum += signal[i] * signal[i];
  return sum;
}

export function peak(signal: Float64Array, { start, end }: Span): number {
  let top = 0;
  for (let i = Math.max(0, start); i < Math.min(signal.length, end); i++)
    top = Math.max(top, Math.abs(signal[i]));
  return top;
}

const ratio = (a: number, b: number) => (b > 0 ? a / b : null);
const nonNull = <T>(values: (T | null)[]) => values.filter((v): v is T => v !== null);

/**
 * Measurements from the sounds of one clip. `signal` is the band-passed working signal, `sounds` its S1/S2
 * spans in time order.
 */
export function measure(signal: Float64Array, sampleRate: number, sounds: SoundSpan[]): Metrics {
  const toS = (i: number) => i / sampleRate;
  const beats: BeatDetail[] = [];
  const energyRatios: number[] = [];
  const peakRatios: number[] = [];
  for (let i = 0; i + 1 < sounds.length; i++) {
    const s1 = sounds[i];
    const s2 = sounds[i + 1];
    if (s1.type !== 'S1' || s2.type !== 'S2') continue;
    const next = sounds[i + 2]?.type === 'S1' ? sounds[i + 2] : null;
    const s1Level = rms(signal, s1);
    const s2Level = rms(signal, s2);
    const systolic = ratio(rms(signal, { start: s1.end, end: s2.start }), (s1Level + s2Level) / 2);
    const diastolic = next
      ? ratio(rms(signal, { start: s2.end, end: next.start }), (s2Level + rms(signal, next)) / 2)
      : null;
    beats.push({
      s1StartS: toS(s1.start),
      s1EndS: toS(s1.end),
      s2StartS: toS(s2.start),
      s2EndS: toS(s2.end),
      nextS1StartS: next ? toS(next.start) : null,
      intervalMs: next ? ((centre(signal, next) - centre(signal, s1)) * 1000) / sampleRate : null,
      systoleMs: ((s2.start - s1.start) * 1000) / sampleRate,
      diastoleMs: next ? ((next.start - s2.start) * 1000) / sampleRate : null,
      systolicActivity: systolic,
      diastolicActivity: diastolic,
    });
    const peakRatio = ratio(peak(signal, s1), peak(signal, s2));
    const energyRatio = ratio(energy(signal, s1), energy(signal, s2));
    if (peakRatio !== null) peakRatios.push(peakRatio);
    if (energyRatio !== null) energyRatios.push(energyRatio);
  }

  const intervals = nonNull(beats.map((b) => b.intervalMs));
  const typical = median(intervals);
  const usable = beats.filter(
    (b) => b.intervalMs !== null && typical !== null && Math.abs(b.intervalMs - typical) <= 0.3 * typical,
  );
  // the same statistic as the CirCor README's rate truth: 60 / median S1-to-S1 interval
  const typicalInterval = median(intervals);
  const heartRateBpm = typicalInterval ? 60000 / typicalInterval : null;
  // the clip's first and last sound may be cut by its edges
  const inner = sounds.slice(1, -1);
  const durationsMs = (type: 'S1' | 'S2') =>
    median(inner.filter((s) => s.type === type).map((s) => ((s.end - s.start) * 1000) / sampleRate));
  const systoleMs = median(beats.map((b) => b.systoleMs));
  const diastoleMs = median(nonNull(beats.map((b) => b.diastoleMs)));
  return {
    heartRateBpm,
    sdnnMs: sdnn(intervals),
    rmssdMs: rmssd(intervals),
    pnn50: pnn50(intervals),
    irregularRhythm: isIrregular(intervals),
    s1DurationMs: durationsMs('S1'),
    s2DurationMs: durationsMs('S2'),
    systoleMs,
    diastoleMs,
    systoleDiastoleRatio: systoleMs !== null && diastoleMs ? systoleMs / diastoleMs : null,
    s1s2PeakRatio: median(peakRatios),
    s1s2EnergyRatio: median(energyRatios),
    systolicActivity: median(nonNull(beats.map((b) => b.systolicActivity))),
    diastolicActivity: median(nonNull(beats.map((b) => b.diastolicActivity))),
    usableCycles: usable.length,
    beats,
  };
}

export function toHeartSounds(signal: Float64Array, sampleRate: number, sounds: SoundSpan[]): HeartSound[] {
  return sounds.map((s) => ({
    type: s.type,
    startS: s.start / sampleRate,
    endS: s.end / sampleRate,
    peakAmplitude: peak(signal, s),
  }));
}
