import { periodicityAt } from './heart-rate';
import type { Metrics } from './types';
import { median } from './variability';

/** The figures that say whether the rate of record can be trusted. */
export interface RateEvidence {
  /** Envelope autocorrelation at the decoded beat cycle (60 / rate): low when the beats do not repeat. */
  periodicity: number | null;
  /** Share of beat-to-beat intervals within 15 % of their median: low when beats were missed or added. */
  steadyShare: number | null;
  /** Rate from the median interval of the first and of the second half of the beats. */
  firstHalfBpm: number | null;
  secondHalfBpm: number | null;
}

/*
 * Chosen on the open CirCor recordings (Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048; both
 * folders, 696 recordings, the committed model): of the 675 clips the verdict called good, 16 had a rate more than
 * 10 bpm from the annotation (half or double rates, skipped beats, drift). These three limits flag 13 of them and
 * 26 of the 552 whose rate was within 3 bpm, so 0.5 % of the clips still called good are more than 10 bpm off.
 */
export const RATE_DOUBT_LIMITS = { periodicity: 0.05, steadyShare: 0.7, drift: 0.2 } as const;

export function rateEvidence(envelope: Float64Array, frameRate: number, metrics: Metrics): RateEvidence {
  const rate = metrics.heartRateBpm;
  const intervals = metrics.beats.map((b) => b.intervalMs).filter((v): v is number => v !== null);
  const typical = median(intervals);
  const half = intervals.length >> 1;
  const firstHalf = median(intervals.slice(0, half));
  const secondHalf = median(intervals.slice(half));
  return {
    periodicity: rate ? periodicityAt(envelope, frameRate, 60 / rate) : null,
    steadyShare: typical
      ? intervals.filter((v) => Math.abs(v - typical) < 0.15 * typical).length / intervals.length
      : null,
    firstHalfBpm: firstHalf ? 60000 / firstHalf : null,
    secondHalfBpm: secondHalf ? 60000 / secondHalf : null,
  };
}

/** Why the rate of record may be wrong, in words; empty when the evidence agrees. */
export function rateDoubts(evidence: RateEvidence): string[] {
  const limits = RATE_DOUBT_LIMITS;
  const doubts: string[] = [];
  const { periodicity, steadyShare, firstHalfBpm: first, secondHalfBpm: second } = evidence;
  if (periodicity !== null && periodicity < limits.periodicity)
    doubts.push('the sound pattern does not repeat at this rate, so it may be half or double the true rate');
  if (steadyShare !== null && steadyShare < limits.steadyShare)
    doubts.push(
      `only ${Math.round(100 * steadyShare)} % of beats are evenly spaced, so beats may have been missed or added`,
    );
  if (first !== null && second !== null && Math.abs(first - second) / Math.min(first, second) > limits.drift)
    doubts.push(
      `the rate changed during the take, from about ${Math.round(first)} to ${Math.round(second)} bpm`,
    );
  return doubts;
}
