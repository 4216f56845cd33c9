import { rateDoubts, type RateEvidence } from './rate-check';
import type { Metrics, Quality, QualityReason } from './types';

export interface QualityInput {
  durationS: number;
  /** Share of input samples in flat runs at the clip's peak level. */
  clippedFraction: number;
  /** Root mean square of the band-passed signal. */
  level: number;
  /** Autocorrelation of the envelope at the chosen cycle, or null when no cycle was found. */
  periodicity: number | null;
  metrics: Metrics;
  /** How well the rate of record agrees with the envelope and with itself; null when no rate was found. */
  rateEvidence: RateEvidence | null;
}

/*
 * Thresholds are ours, set so the development recordings pass and silence, noise and clipped takes do not
 * (common practice, no source).
 */
export const QUALITY_LIMITS = {
  retakeBelowS: 4,
  usableBelowS: 8,
  retakeClippedFraction: 0.005,
  usableClippedFraction: 0.0005,
  silentLevel: 1e-5,
  noBeatRestActivity: 0.85,
  retakeRestActivity: 0.7,
  usableRestActivity: 0.55,
  retakeCycles: 3,
  usableCycles: 6,
  lowRateBpm: 40,
  highRateBpm: 180,
} as const;

type Severity = 'usable' | 'retake';

export function assessQuality(input: QualityInput): Quality {
  const limits = QUALITY_LIMITS;
  const found: { code: QualityReason; message: string; severity: Severity }[] = [];
  const add = (code: QualityReason, severity: Severity, message: string) =>
    found.push({ code, message, severity });
  const { durationS, clippedFraction, level, periodicity, metrics, rateEvidence } = input;

  if (durationS < limits.retakeBelowS)
    add(
      'too_short',
      'retake',
      `The clip lasts ${durationS.toFixed(1)} s; record at least ${limits.usableBelowS} s.`,
    );
  else if (durationS < limits.usableBelowS)
    add(
      'too_short',
      'usable',
      `The clip lasts ${durationS.toFixed(1)} s; ${limits.usableBelowS} s or more gives steadier figures.`,
    );

  if (clippedFraction > limits.retakeClippedFraction)
    add(
      'clipped',
      'retake',
      'The signal hits the top of its range often; lower the gain or press more lightly.',
    );
  else if (clippedFraction > limits.usableClippedFraction)
    add('clipped', 'usable', 'The signal hits the top of its range now and then.');

  const silent = level < limits.silentLevel;
  // a murmur fills one rest interval; noise fills both, so the quieter of the two measures the noise
  const restActivity = Math.min(metrics.systolicActivity ?? Infinity, metrics.diastolicActivity ?? Infinity);
  const hasRest = Number.isFinite(restActivity);
  let noBeat = false;
  if (durationS >= limits.retakeBelowS) {
    noBeat = silent || metrics.heartRateBpm === null || !hasRest || restActivity > limits.noBeatRestActivity;
    if (silent) add('no_heartbeat', 'retake', 'The clip is silent.');
    else if (noBeat)
      add(
        'no_heartbeat',
        'retake',
        'No distinct heart sounds were found; check the placement of the chest piece.',
      );
    else if (restActivity > limits.retakeRestActivity)
      add('too_noisy', 'retake', 'Background sound is nearly as loud as the heart sounds.');
    else if (restActivity > limits.usableRestActivity)
      add('too_noisy', 'usable', 'There is noticeable background sound between the heart sounds.');
  }
  if (durationS >= limits.retakeBelowS && !noBeat) {
    if (metrics.usableCycles < limits.retakeCycles)
      add('too_few_cycles', 'retake', `Only ${metrics.usableCycles} clean heart cycles were found.`);
    else if (metrics.usableCycles < limits.usableCycles)
      add('too_few_cycles', 'usable', `Only ${metrics.usableCycles} clean heart cycles were found.`);
  }
  const rate = metrics.heartRateBpm;
  const doubts = !noBeat && rate !== null && rateEvidence ? rateDoubts(rateEvidence) : [];
  if (doubts.length > 0)
    add(
      'rate_unsure',
      'usable',
      `The heart rate of ${Math.round(rate as number)} bpm is uncertain: ${doubts.join('; ')}. Count the pulse by hand before relying on it.`,
    );
  if (rate !== null && (rate < limits.lowRateBpm || rate > limits.highRateBpm)) {
    add(
      'rate_out_of_range',
      'usable',
      `The rate of ${Math.round(rate)} bpm is outside the ${limits.lowRateBpm}–${limits.highRateBpm} bpm range this analysis is checked for.`,
    );
  }

  const verdict = found.some((f) => f.severity === 'retake') ? 'retake' : found.length ? 'usable' : 'good';
  return {
    verdict,
    reasons: found.map(({ code, message }) => ({ code, message })),
    measures: {
      periodicity,
      clippedFraction,
      restActivity: hasRest ? restActivity : null,
    },
  };
}

/** Share of samples in runs of three or more at (or within 0.1 % of) the clip's largest absolute value. */
export function clippedFraction(samples: Float32Array): number {
  let top = 0;
  for (let i = 0; i < samples.length; i++) top = Math.max(top, Math.abs(samples[i]));
  if (top === 0) return 0;
  const threshold = top * 0.999;
  let clipped = 0;
  let run = 0;
  for (let i = 0; i <= samples.length; i++) {
    if (i < samples.length && Math.abs(samples[i]) >= threshold) run++;
    else {
      if (run >= 3) clipped += run;
      run = 0;
    }
  }
  return clipped / samples.length;
}
