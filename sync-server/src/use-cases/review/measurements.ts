import { rangeStatusWords, referToClinician } from '@/shared/cautions';
import type { Site } from '@/shared/protocol';
import type { AnalysisSummary } from '@/shared/protocol/analysis';
import type { Measurement, MeasurementStatus, MurmurScreen } from '@/shared/protocol/review';

/** The metrics of a stored analysis; partial, since a measure may be missing from what is shown. */
export type SiteMetrics = Partial<AnalysisSummary['metrics']>;
/** The metrics that are a single number (or none). */
export type MetricKey = {
  [K in keyof SiteMetrics]-?: NonNullable<SiteMetrics[K]> extends number ? K : never;
}[keyof SiteMetrics];

export type MeasurementDef = { key: MetricKey; label: string; unit: string };
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

/**
 * The measures the clinic's ranges mark "refer": outside range, they read "refer to a licensed clinician" and flag
 * the session. The brief's cautions name the rate; activity in the rest intervals is what a murmur adds. Any other
 * measure outside range is a note to compare across visits, so no row ever says "refer" on a session that is not
 * flagged. The list filter's SQL (repositories/review-repository.ts) reads the same measures.
 */
export const referralKeys = ['heartRateBpm', 'systolicActivity', 'diastolicActivity'] as const;
const isReferralKey = (key: string) => (referralKeys as readonly string[]).includes(key);

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
  if ((status === 'below' || status === 'above') && !isReferralKey(key)) {
    return `${status === 'below' ? 'Below' : 'Above'} range: note it and compare across visits`;
  }
  const words = rangeStatusWords(status, referToClinician);
  return words[0].toUpperCase() + words.slice(1);
}

export function metricValue(metrics: SiteMetrics | null | undefined, key: MetricKey): number | null {
  const v = metrics?.[key];
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

export function evaluateSite(
  metrics: SiteMetrics | null | undefined,
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

const formatted = (value: number | null, unit: string) =>
  value === null
    ? ''
    : ` (${Math.abs(value) >= 10 ? Math.round(value) : value.toFixed(2)}${unit ? ` ${unit}` : ''})`;

/**
 * Why a site flags its session for referral, in words: an irregular rhythm, a possible murmur, or a measure the
 * clinic's ranges mark "refer" outside its range. Empty when the site does not flag.
 */
export function siteReferralReasons(
  metrics: SiteMetrics | null | undefined,
  measurements: Measurement[],
  screen: MurmurScreen | null,
): string[] {
  const reasons: string[] = [];
  if (screen?.murmur === 'possible') reasons.push('Possible murmur');
  if (metrics?.irregularRhythm === true) reasons.push('Irregular rhythm');
  for (const m of measurements) {
    if (!isReferralKey(m.key) || (m.status !== 'above' && m.status !== 'below')) continue;
    reasons.push(`${m.label} ${m.status} the clinic's range${formatted(m.value, m.unit)}`);
  }
  return reasons;
}
