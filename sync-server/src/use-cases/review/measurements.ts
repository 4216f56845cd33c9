import { referToClinician } from '@/constants/cautions';
import type { Site } from '@/shared/protocol';
import type { Measurement, MeasurementStatus } from '@/shared/protocol/review';

export type MeasurementDef = { key: string; label: string; unit: string };
export type Range = { low: number | null; high: number | null; source: string };
export type RangeLookup = (key: string, site: Site) => Range | null;

// The measurements of the brief, in the order a practitioner reads them; keys are AnalysisResult metrics.
export const measurementDefs: readonly MeasurementDef[] = [
  { key: 'heartRateBpm', label: 'Heart rate', unit: 'bpm' },
  { key: 'sdnnMs', label: 'Beat-to-beat variability (SDNN)', unit: 'ms' },
  { key: 'rmssdMs', label: 'Beat-to-beat variability (RMSSD)', unit: 'ms' },
  { key: 'pnn50', label: 'Successive beats differing by over 50 ms (pNN50)', unit: '%' },
  { key: 's1DurationMs', label: 'S1 duration', unit: 'ms' },
  { key: 's2DurationMs', label: 'S2 duration', unit: 'ms' },
  { key: 'systoleMs', label: 'Systolic interval', unit: 'ms' },
  { key: 'diastoleMs', label: 'Diastolic interval', unit: 'ms' },
  { key: 'systoleDiastoleRatio', label: 'Systole : diastole', unit: '' },
  { key: 's1s2PeakRatio', label: 'S1 : S2 loudness (peak)', unit: '' },
  { key: 's1s2EnergyRatio', label: 'S1 : S2 loudness (energy)', unit: '' },
  { key: 'systolicActivity', label: 'Activity in systole', unit: '' },
  { key: 'diastolicActivity', label: 'Activity in diastole', unit: '' },
  { key: 'usableCycles', label: 'Usable cycles', unit: '' },
];

/** The metrics whose being out of range flags a session for referral (the brief's cautions name rate and rhythm). */
export const referralKeys = ['heartRateBpm', 'systolicActivity', 'diastolicActivity'] as const;

export function statusOf(value: number | null, range: Range | null): MeasurementStatus {
  if (value === null || !Number.isFinite(value)) return 'no_value';
  if (!range || (range.low === null && range.high === null)) return 'no_range';
  if (range.low !== null && value < range.low) return 'below';
  if (range.high !== null && value > range.high) return 'above';
  return 'in_range';
}

/** Measurements of the recording itself: out of range means retake, not referral. */
export const recordingQualityKeys = ['usableCycles'] as const;

/**
 * Beat-interval variability from a clip of seconds, read against references from 5-minute records: a short
 * clip's figure swings widely, so one outside value is a note to watch across visits, not a referral by itself.
 */
export const shortClipVariabilityKeys = ['sdnnMs', 'rmssdMs', 'pnn50'] as const;

export function readingOf(status: MeasurementStatus, key = ''): string {
  if (
    (shortClipVariabilityKeys as readonly string[]).includes(key) &&
    (status === 'below' || status === 'above')
  ) {
    return `${status === 'below' ? 'Below' : 'Above'} range for a short clip: compare across visits; if it persists, ${referToClinician}`;
  }
  if (
    (recordingQualityKeys as readonly string[]).includes(key) &&
    (status === 'below' || status === 'above')
  ) {
    return 'Outside range: too few clean cycles for steady figures; consider a retake';
  }
  switch (status) {
    case 'in_range':
      return 'Within range';
    case 'below':
      return `Below range: ${referToClinician}`;
    case 'above':
      return `Above range: ${referToClinician}`;
    case 'no_range':
      return 'No range set';
    default:
      return 'Not measured';
  }
}

export type MetricsLike = Record<string, unknown> & { irregularRhythm?: unknown };

export function metricValue(metrics: MetricsLike | null | undefined, key: string): number | null {
  const v = metrics?.[key];
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

export function evaluateSite(
  metrics: MetricsLike | null | undefined,
  site: Site,
  ranges: RangeLookup,
): Measurement[] {
  return measurementDefs.map((def) => {
    const value = metricValue(metrics, def.key);
    const range = ranges(def.key, site);
    const status = statusOf(value, range);
    return { ...def, value, range, status, reading: readingOf(status, def.key) };
  });
}

/** A site reads "refer to a licensed clinician" when its rhythm is irregular or a referral metric is out of range. */
export function siteNeedsReferral(
  metrics: MetricsLike | null | undefined,
  measurements: Measurement[],
): boolean {
  if (metrics?.irregularRhythm === true) return true;
  return measurements.some(
    (m) =>
      (referralKeys as readonly string[]).includes(m.key) && (m.status === 'above' || m.status === 'below'),
  );
}
