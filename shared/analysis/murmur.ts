import { butter, type TransferFunction } from './butterworth';
import { lfilter } from './filtfilt';
import type { SoundSpan } from './measurements';
import type { MurmurScreen, Quality } from './types';
import murmurModelJson from './model/murmur-model.json';
import { median } from './variability';

/*
 * Murmur screen: does sound fill the rest intervals (systole S1→S2, diastole S2→S1) the way a murmur does? It is a
 * screen, not a diagnosis: a possible murmur is always shown as "refer to a licensed clinician".
 * Features are our own, computed on the segmentation: level and pitch of the middle of each rest interval against
 * the sounds around it (in three bands: whole, above 100 Hz, above 200 Hz), against the other rest interval and
 * against the clip's quiet floor, as medians over beats; how much of systole carries sound (each third, and the
 * share of 10 ms blocks over diastole's typical level) and how steadily; how many beats show it and how much that
 * varies. Level ratios against the clip's own S1/S2 make a quiet and a loud clip compare alike. A logistic
 * regression over the features is fitted by scripts/analysis/fit-murmur.ts and committed in model/murmur-model.json.
 * A visit is possible when any site is, and also when two of its sites are borderline: a murmur is usually heard at
 * more than one site, while a site that scores high by chance (a rub, a cry, a noisy contact) is usually alone. The
 * capture judges a site alone (the higher threshold) before the other sites exist; the visit adds the second rule.
 */

/** Share of each rest interval left out at either end, so the edges of S1 and S2 do not count as a murmur. */
const SYSTOLE_TRIM = 0.15;
const DIASTOLE_TRIM = 0.1;
/** Shortest middle of a rest interval worth measuring, in seconds. */
const MIN_INTERVAL_S = 0.02;
/** Split between the low and the high band (the high band carries most of a murmur's blowing sound). */
const SPLIT_HZ = 100;
/** Lower edge of the top band, where S1 and S2 have little left and a harsh murmur still has some. */
const TOP_HZ = 200;
/** Block length for occupancy: the share of systole's blocks that carry sound. */
const BLOCK_S = 0.01;
/** A systolic block is occupied when its high-band level is this many times the median block of diastole. */
const OCCUPIED_RATIO = 2;
const STRONGLY_OCCUPIED_RATIO = 4;
/** A beat counts as having sound through systole when its middle is this many times the level of diastole's. */
const FILLED_RATIO = 1.5;
/** Fewer complete beats than this and the screen says it cannot tell. */
export const MIN_SCREEN_BEATS = 3;

export const MURMUR_FEATURES = [
  'systoleVsSounds',
  'diastoleVsSounds',
  'systoleVsDiastole',
  'systoleVsS2',
  'systoleHighVsDiastoleHigh',
  'systoleHighShare',
  'diastoleHighShare',
  'systoleVsFloor',
  'diastoleVsFloor',
  'systoleFilledShare',
  'systoleVsDiastoleSpread',
  'systoleHighVsS2High',
  'systoleHighVsFloorHigh',
  'systoleVsDiastoleLowQuartile',
  'systoleHighVsDiastoleHighLowQuartile',
  'systoleEvenness',
  'systoleTopVsDiastoleTop',
  'systoleTopVsSoundsTop',
  'systoleHighVsSoundsHigh',
  'diastoleHighVsSoundsHigh',
  'systoleQuietestThirdVsDiastole',
  'systoleHighQuietestThirdVsDiastoleHigh',
  'systoleHighMiddleThirdVsDiastoleHigh',
  'systoleMiddleThirdVsSounds',
  'systoleHighOccupancy',
  'systoleHighOccupancyStrong',
  'systoleHighSteadiness',
  'systoleHighFilledShare',
  'systoleTopVsDiastoleTopLowQuartile',
  'systoleHighVsDiastoleHighSpread',
  'systoleHighOccupancyLowQuartile',
] as const;

export type MurmurFeatureName = (typeof MURMUR_FEATURES)[number];

export interface MurmurFeatures {
  /** Complete beats (S1, S2, next S1) the medians are taken over. */
  beats: number;
  values: Record<MurmurFeatureName, number>;
}

export interface MurmurModel {
  version: string;
  /** Feature names in the order of `mean`, `scale` and `weights`. */
  features: MurmurFeatureName[];
  mean: number[];
  scale: number[];
  weights: number[];
  bias: number;
  /** A site is `possible` on its own at or above this score. */
  threshold: number;
  /** A visit is `possible` when two of its sites score at or above this (never above `threshold`). */
  pairThreshold: number;
  /** How the parameters were fitted and what they scored; for people, not read by the code. */
  notes?: Record<string, unknown>;
}

/** The fitted screen committed with the code. */
export const committedModel = murmurModelJson as MurmurModel;

interface Span {
  start: number;
  end: number;
}

const highPassFilters = new Map<string, TransferFunction>();

function highPassFilter(cutoffHz: number, sampleRate: number): TransferFunction {
  const key = `${cutoffHz}/${sampleRate}`;
  let filter = highPassFilters.get(key);
  if (!filter) {
    filter = butter(2, cutoffHz, sampleRate, 'highpass');
    if (highPassFilters.size > 8) highPassFilters.clear();
    highPassFilters.set(key, filter);
  }
  return filter;
}

/** Mean squares of consecutive blocks of `block` samples inside a span. */
function blockLevels(signal: Float64Array, { start, end }: Span, block: number): number[] {
  const levels: number[] = [];
  for (let from = start; from + block <= end; from += block)
    levels.push(meanSquare(signal, { start: from, end: from + block }));
  return levels;
}

function meanSquare(signal: Float64Array, { start, end }: Span): number {
  let sum = 0;
  const from = Math.max(0, start);
  const to = Math.min(signal.length, end);
  for (let i = from; i < to; i++) sum += signal[i] * signal[i];
  return to > from ? sum / (to - from) : 0;
}

function middle({ start, end }: Span, trim: number): Span {
  const cut = Math.round((end - start) * trim);
  return { start: start + cut, end: end - cut };
}

function quantile(sorted: number[], q: number): number {
  const at = (sorted.length - 1) * q;
  const below = Math.floor(at);
  const above = Math.min(sorted.length - 1, below + 1);
  return sorted[below] + (sorted[above] - sorted[below]) * (at - below);
}

/** The clip's quiet floor: the 5th percentile of 20 ms block mean squares (what is left between sounds). */
function floorLevel(signal: Float64Array, sampleRate: number): number {
  const block = Math.max(1, Math.round(0.02 * sampleRate));
  const levels: number[] = [];
  for (let start = 0; start + block <= signal.length; start += block)
    levels.push(meanSquare(signal, { start, end: start + block }));
  levels.sort((a, b) => a - b);
  return levels.length ? quantile(levels, 0.05) : 0;
}

/**
 * Features of one clip from its band-passed working signal and its S1/S2 spans (sample indices, time order), or null
 * when fewer than MIN_SCREEN_BEATS complete beats have measurable rest intervals.
 */
export function murmurFeatures(
  signal: Float64Array,
  sampleRate: number,
  sounds: SoundSpan[],
): MurmurFeatures | null {
  // one forward pass: only powers over intervals are used, so the filter's phase does not matter, and the low
  // band is what the high band leaves (keeps the screen within the analysis's speed budget)
  const { b, a } = highPassFilter(SPLIT_HZ, sampleRate);
  const high = lfilter(b, a, signal);
  const topFilter = highPassFilter(TOP_HZ, sampleRate);
  const top = lfilter(topFilter.b, topFilter.a, signal);
  const block = Math.max(1, Math.round(BLOCK_S * sampleRate));
  const low = new Float64Array(signal.length);
  for (let i = 0; i < signal.length; i++) low[i] = signal[i] - high[i];
  const minLength = MIN_INTERVAL_S * sampleRate;
  // a level 60 dB under the clip's mean power keeps the logarithms finite on silent stretches
  const tiny = meanSquare(signal, { start: 0, end: signal.length }) * 1e-6 + 1e-20;
  const floor = floorLevel(signal, sampleRate) + tiny;
  const floorHigh = floorLevel(high, sampleRate) + tiny;
  // half the natural log of a power ratio is the log of the RMS ratio
  const logRatio = (a: number, b: number) => 0.5 * Math.log((a + tiny) / (b + tiny));
  const per: Record<MurmurFeatureName, number[]> = Object.fromEntries(
    MURMUR_FEATURES.map((name) => [name, []]),
  ) as unknown as Record<MurmurFeatureName, number[]>;
  const systoleVsDiastole: number[] = [];
  const highVsHigh: number[] = [];
  const topVsTop: number[] = [];
  const occupancy: number[] = [];
  for (let i = 0; i + 2 < sounds.length; i++) {
    const [s1, s2, next] = [sounds[i], sounds[i + 1], sounds[i + 2]];
    if (s1.type !== 'S1' || s2.type !== 'S2' || next.type !== 'S1') continue;
    const systole = middle({ start: s1.end, end: s2.start }, SYSTOLE_TRIM);
    const diastole = middle({ start: s2.end, end: next.start }, DIASTOLE_TRIM);
    if (systole.end - systole.start < minLength || diastole.end - diastole.start < minLength) continue;
    const sys = meanSquare(signal, systole);
    const dia = meanSquare(signal, diastole);
    const s1Level = meanSquare(signal, s1);
    const s2Level = meanSquare(signal, s2);
    const nextLevel = meanSquare(signal, next);
    const sysHigh = meanSquare(high, systole);
    const diaHigh = meanSquare(high, diastole);
    per.systoleVsSounds.push(logRatio(sys, (s1Level + s2Level) / 2));
    per.diastoleVsSounds.push(logRatio(dia, (s2Level + nextLevel) / 2));
    per.systoleVsDiastole.push(logRatio(sys, dia));
    per.systoleVsS2.push(logRatio(sys, s2Level));
    per.systoleHighVsDiastoleHigh.push(logRatio(sysHigh, diaHigh));
    per.systoleHighShare.push(logRatio(sysHigh, meanSquare(low, systole)));
    per.diastoleHighShare.push(logRatio(diaHigh, meanSquare(low, diastole)));
    per.systoleVsFloor.push(logRatio(sys, floor));
    per.diastoleVsFloor.push(logRatio(dia, floor));
    per.systoleHighVsS2High.push(logRatio(sysHigh, meanSquare(high, s2)));
    per.systoleHighVsFloorHigh.push(logRatio(sysHigh, floorHigh));
    const half = Math.round((systole.start + systole.end) / 2);
    const first = meanSquare(signal, { start: systole.start, end: half });
    const second = meanSquare(signal, { start: half, end: systole.end });
    per.systoleEvenness.push(logRatio(Math.min(first, second), Math.max(first, second)));
    systoleVsDiastole.push(logRatio(sys, dia));
    highVsHigh.push(logRatio(sysHigh, diaHigh));

    // the same against the sounds' own level in each band, so a quiet or loud clip compares alike
    const soundsHigh = (meanSquare(high, s1) + meanSquare(high, s2)) / 2;
    const sysTop = meanSquare(top, systole);
    const diaTop = meanSquare(top, diastole);
    per.systoleTopVsDiastoleTop.push(logRatio(sysTop, diaTop));
    per.systoleTopVsSoundsTop.push(logRatio(sysTop, (meanSquare(top, s1) + meanSquare(top, s2)) / 2));
    per.systoleHighVsSoundsHigh.push(logRatio(sysHigh, soundsHigh));
    per.diastoleHighVsSoundsHigh.push(logRatio(diaHigh, soundsHigh));
    topVsTop.push(logRatio(sysTop, diaTop));
    // a murmur through systole fills each third of it, not only the tails of S1 and S2
    const third = (systole.end - systole.start) / 3;
    const thirds = [0, 1, 2].map((k) => ({
      start: Math.round(systole.start + k * third),
      end: Math.round(systole.start + (k + 1) * third),
    }));
    const thirdLevels = thirds.map((span) => meanSquare(signal, span));
    const thirdHighLevels = thirds.map((span) => meanSquare(high, span));
    per.systoleQuietestThirdVsDiastole.push(logRatio(Math.min(...thirdLevels), dia));
    per.systoleHighQuietestThirdVsDiastoleHigh.push(logRatio(Math.min(...thirdHighLevels), diaHigh));
    per.systoleHighMiddleThirdVsDiastoleHigh.push(logRatio(thirdHighLevels[1], diaHigh));
    per.systoleMiddleThirdVsSounds.push(logRatio(thirdLevels[1], (s1Level + s2Level) / 2));
    // occupancy: how much of systole carries high-band sound over diastole's typical level, and how steadily
    const diastoleBlocks = blockLevels(high, diastole, block);
    const systoleBlocks = blockLevels(high, systole, block);
    if (diastoleBlocks.length > 0 && systoleBlocks.length > 0) {
      const typical = median(diastoleBlocks) as number;
      const share = (ratio: number) =>
        systoleBlocks.filter((x) => x > ratio * typical).length / systoleBlocks.length;
      per.systoleHighOccupancy.push(share(OCCUPIED_RATIO));
      per.systoleHighOccupancyStrong.push(share(STRONGLY_OCCUPIED_RATIO));
      occupancy.push(share(OCCUPIED_RATIO));
      // log of geometric over arithmetic mean of the block levels: 0 for a steady sound, below for a fading one
      const logMean = systoleBlocks.reduce((sum, x) => sum + Math.log(x + tiny), 0) / systoleBlocks.length;
      const mean = systoleBlocks.reduce((sum, x) => sum + x, 0) / systoleBlocks.length;
      per.systoleHighSteadiness.push(logMean - Math.log(mean + tiny));
    }
  }
  const beats = systoleVsDiastole.length;
  if (beats < MIN_SCREEN_BEATS) return null;
  const values = {} as Record<MurmurFeatureName, number>;
  for (const name of MURMUR_FEATURES) values[name] = median(per[name]) ?? 0;
  const filled = Math.log(FILLED_RATIO);
  values.systoleFilledShare = systoleVsDiastole.filter((r) => r > filled).length / beats;
  const sorted = [...systoleVsDiastole].sort((a, b) => a - b);
  values.systoleVsDiastoleSpread = quantile(sorted, 0.75) - quantile(sorted, 0.25);
  values.systoleVsDiastoleLowQuartile = quantile(sorted, 0.25);
  const sortedHigh = [...highVsHigh].sort((a, b) => a - b);
  values.systoleHighVsDiastoleHighLowQuartile = quantile(sortedHigh, 0.25);
  values.systoleHighVsDiastoleHighSpread = quantile(sortedHigh, 0.75) - quantile(sortedHigh, 0.25);
  values.systoleHighFilledShare = highVsHigh.filter((r) => r > filled).length / beats;
  values.systoleTopVsDiastoleTopLowQuartile = quantile(
    [...topVsTop].sort((a, b) => a - b),
    0.25,
  );
  values.systoleHighOccupancyLowQuartile = occupancy.length
    ? quantile(
        [...occupancy].sort((a, b) => a - b),
        0.25,
      )
    : 0;
  return { beats, values };
}

/** The model's probability that the site has a murmur, 0–1. */
export function murmurScore(features: MurmurFeatures, model: MurmurModel): number {
  const z = model.features.reduce(
    (sum, name, j) => sum + (model.weights[j] * (features.values[name] - model.mean[j])) / model.scale[j],
    model.bias,
  );
  return 1 / (1 + Math.exp(-z));
}

const times = (logRms: number) => Math.exp(logRms).toFixed(1);
const percent = (logRms: number) => `${Math.round(100 * Math.exp(logRms))} %`;

/**
 * The measured facts behind a call, in plain words. Written from the features themselves rather than from the
 * regression's weights: several features overlap, so a single weight can carry a sign that reads backwards.
 */
function reasonsFor(
  features: MurmurFeatures,
  score: number,
  model: MurmurModel,
  possible: boolean,
): string[] {
  const v = features.values;
  const n = features.beats;
  const filledBeats = Math.round(v.systoleFilledShare * n);
  const highRatio = v.systoleHighVsDiastoleHigh;
  const reasons: string[] = [];
  if (possible) {
    if (v.systoleVsDiastole > 0) {
      const level = v.systoleVsS2 > 0 ? 'louder than S2' : `at ${percent(v.systoleVsS2)} of the level of S2`;
      reasons.push(
        `${filledBeats * 2 >= n ? 'steady sound' : 'sound'} through systole (between S1 and S2) in ${filledBeats} of ${n} beats, ${level}`,
      );
    }
    if (highRatio > 0)
      reasons.push(
        `more high-pitched sound (above ${SPLIT_HZ} Hz) in systole than in diastole (${times(highRatio)} times)`,
      );
    if (v.diastoleVsSounds > v.systoleVsSounds)
      reasons.push(
        `sound through diastole (between S2 and the next S1) at ${percent(v.diastoleVsSounds)} of the level of the heart sounds`,
      );
  } else {
    reasons.push(
      `systole (between S1 and S2) is ${times(v.systoleVsDiastole)} times the level of diastole; sound fills it in ${filledBeats} of ${n} beats`,
    );
    if (score >= model.pairThreshold)
      reasons.push(
        'borderline: the visit is flagged as a possible murmur if another site of the same visit is borderline too',
      );
    if (highRatio <= Math.log(FILLED_RATIO))
      reasons.push(`no more high-pitched sound (above ${SPLIT_HZ} Hz) in systole than in diastole`);
  }
  reasons.push(
    `the sound between the heart sounds ${possible ? 'resembles' : 'does not resemble'} that of murmurs in open reference recordings (score ${score.toFixed(2)}; ${model.threshold.toFixed(2)} or more is flagged)`,
  );
  return reasons;
}

/** The screen of one site: `unsure` when the clip is too poor to tell, else `possible` or `unlikely` with reasons. */
export function screenMurmur(
  features: MurmurFeatures | null,
  quality: Pick<Quality, 'verdict' | 'reasons'>,
  model: MurmurModel,
): MurmurScreen {
  if (quality.verdict === 'retake') {
    return {
      murmur: 'unsure',
      score: 0,
      reasons: [
        'the clip is too poor to tell; retake it',
        ...quality.reasons.map((r) => r.message.replace(/\.$/, '')),
      ],
    };
  }
  if (features === null)
    return {
      murmur: 'unsure',
      score: 0,
      reasons: [`fewer than ${MIN_SCREEN_BEATS} complete heart cycles to judge from; retake the clip`],
    };
  const score = murmurScore(features, model);
  const possible = score >= model.threshold;
  return {
    murmur: possible ? 'possible' : 'unlikely',
    score,
    reasons: reasonsFor(features, score, model, possible),
  };
}

/** A site's score at or above this is borderline: the visit is flagged when two of its sites are. */
export const MURMUR_PAIR_THRESHOLD = committedModel.pairThreshold;

const isBorderline = (s: MurmurScreen, pairThreshold: number) =>
  s.murmur === 'unlikely' && s.score >= pairThreshold;

/**
 * Each site's screen as the visit reads it: when the visit is possible because two or more sites are borderline,
 * those sites read `possible` too, with the reason first, so every screen, report and filter that shows a site
 * says what the visit says. Otherwise the sites' own screens, unchanged.
 */
export function screensInVisit<S extends MurmurScreen | null | undefined>(
  screens: readonly S[],
  model: Pick<MurmurModel, 'pairThreshold'> = committedModel,
): (S | MurmurScreen)[] {
  const judged = screens.filter((s): s is NonNullable<S> => !!s);
  if (judged.some((s) => s.murmur === 'possible')) return [...screens];
  const borderline = judged.filter((s) => isBorderline(s, model.pairThreshold));
  if (borderline.length < 2) return [...screens];
  return screens.map((s) =>
    s && isBorderline(s, model.pairThreshold)
      ? {
          ...s,
          murmur: 'possible' as const,
          reasons: [
            `borderline here and at ${borderline.length - 1 === 1 ? 'another site' : `${borderline.length - 1} other sites`} of this visit, which together flag a possible murmur`,
            ...s.reasons.filter((r) => !r.startsWith('borderline:')),
          ],
        }
      : s,
  );
}

/**
 * The screen of a visit over its sites: `possible` when any site is or when two sites score at or above the model's
 * pair threshold (both borderline), else `unsure` when any site could not be judged (that site may hide one), else
 * `unlikely`. Sites without a screen are ignored.
 */
export function visitMurmurScreen(
  sites: readonly ({ screen?: MurmurScreen | null } | null | undefined)[],
  model: Pick<MurmurModel, 'pairThreshold'> = committedModel,
): MurmurScreen['murmur'] | null {
  const screens = sites.map((s) => s?.screen).filter((s): s is MurmurScreen => !!s);
  if (screens.length === 0) return null;
  if (screens.some((s) => s.murmur === 'possible')) return 'possible';
  if (screens.filter((s) => isBorderline(s, model.pairThreshold)).length >= 2) return 'possible';
  if (screens.some((s) => s.murmur === 'unsure')) return 'unsure';
  return 'unlikely';
}
