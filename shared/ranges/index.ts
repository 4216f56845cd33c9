import type { Metrics, SiteCode } from '../analysis/types';

export type RangeMetric = Exclude<keyof Metrics, 'beats' | 'irregularRhythm'>;

export interface ReferenceRange {
  /** null: no lower limit. */
  low: number | null;
  /** null: no upper limit. */
  high: number | null;
  unit: string;
  source: string;
}

export type RangeTable = Record<RangeMetric, Record<SiteCode, ReferenceRange>>;
export type RangeVerdict = 'below' | 'within' | 'above' | 'unknown';

const SITES: SiteCode[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

const everySite = (range: ReferenceRange): Record<SiteCode, ReferenceRange> =>
  Object.fromEntries(SITES.map((site) => [site, range])) as Record<SiteCode, ReferenceRange>;

const apexAndBase = (apex: ReferenceRange, base: ReferenceRange): Record<SiteCode, ReferenceRange> => ({
  mitral: apex,
  tricuspid: apex,
  aortic: base,
  pulmonic: base,
});

const SHORT_CLIP_NOTE = 'Clips last seconds, not the 5 minutes these norms assume; read as a rough guide.';

/** Adult resting ranges. Children run faster and vary more; a clinic sets its own ranges where it needs to. */
export const DEFAULT_RANGES: RangeTable = {
  heartRateBpm: everySite({
    low: 60,
    high: 100,
    unit: 'bpm',
    source: 'Adult resting rate of 60–100 bpm, American Heart Association public guidance (from memory).',
  }),
  sdnnMs: everySite({
    low: 32,
    high: 93,
    unit: 'ms',
    source: `Short-term SDNN in healthy adults, Nunan et al., Pacing Clin Electrophysiol 2010 (from memory). ${SHORT_CLIP_NOTE}`,
  }),
  rmssdMs: everySite({
    low: 19,
    high: 75,
    unit: 'ms',
    source: `Short-term RMSSD in healthy adults, Nunan et al., Pacing Clin Electrophysiol 2010 (from memory). ${SHORT_CLIP_NOTE}`,
  }),
  pnn50: everySite({
    low: null,
    high: 40,
    unit: '%',
    source: `Common practice, no source. ${SHORT_CLIP_NOTE}`,
  }),
  s1DurationMs: everySite({
    low: 80,
    high: 170,
    unit: 'ms',
    source:
      'S1 state duration 122 ± 22 ms (mean ± 2 SD) in the segmentation model of Springer et al., IEEE TBME 2016 (from memory).',
  }),
  s2DurationMs: everySite({
    low: 50,
    high: 140,
    unit: 'ms',
    source:
      'S2 state duration 94 ± 22 ms (mean ± 2 SD) in the segmentation model of Springer et al., IEEE TBME 2016 (from memory).',
  }),
  systoleMs: everySite({
    low: 250,
    high: 420,
    unit: 'ms',
    source: 'S1 onset to S2 onset at adult resting rates; common practice, no source.',
  }),
  diastoleMs: everySite({
    low: 350,
    high: 900,
    unit: 'ms',
    source: 'S2 onset to next S1 onset at adult resting rates; common practice, no source.',
  }),
  systoleDiastoleRatio: everySite({
    low: 0.35,
    high: 0.75,
    unit: 'ratio',
    source:
      'At about 72 bpm diastole lasts about twice as long as systole (ratio near 0.5); the ratio rises with rate. Common practice, no source.',
  }),
  s1s2PeakRatio: apexAndBase(
    {
      low: 1,
      high: 3,
      unit: 'ratio',
      source:
        "S1 louder than S2 at the apex sites (Bates' Guide to Physical Examination, from memory); about two to three times as high at the mitral site is common practice, no source.",
    },
    {
      low: 0.3,
      high: 1,
      unit: 'ratio',
      source:
        "S2 louder than S1 at the base sites (Bates' Guide to Physical Examination, from memory); the lower limit is common practice, no source.",
    },
  ),
  s1s2EnergyRatio: apexAndBase(
    {
      low: 1,
      high: 9,
      unit: 'ratio',
      source: 'The square of the peak-ratio range at the apex sites; common practice, no source.',
    },
    {
      low: 0.1,
      high: 1,
      unit: 'ratio',
      source: 'The square of the peak-ratio range at the base sites; common practice, no source.',
    },
  ),
  systolicActivity: everySite({
    low: null,
    high: 0.45,
    unit: 'ratio',
    source:
      'Our own limit: about the 90th percentile of recordings without a noted murmur in the CirCor DigiScope development subset (doi:10.13026/tshs-mw03). No published source.',
  }),
  diastolicActivity: everySite({
    low: null,
    high: 0.45,
    unit: 'ratio',
    source:
      'Our own limit: about the 90th percentile of recordings without a noted murmur in the CirCor DigiScope development subset (doi:10.13026/tshs-mw03). No published source.',
  }),
  usableCycles: everySite({
    low: 6,
    high: null,
    unit: 'cycles',
    source:
      'Our quality rule: fewer than 6 clean cycles make the figures unsteady. Common practice, no source.',
  }),
};

export function evaluateRange(
  value: number | null | undefined,
  range: ReferenceRange | undefined,
): RangeVerdict {
  if (value === null || value === undefined || !Number.isFinite(value) || !range) return 'unknown';
  if (range.low !== null && value < range.low) return 'below';
  if (range.high !== null && value > range.high) return 'above';
  return 'within';
}

export type RangeOverrides = Partial<Record<RangeMetric, Partial<Record<SiteCode, Partial<ReferenceRange>>>>>;

/** The range for a metric at a site, with a clinic's own limits laid over the defaults. */
export function rangeFor(metric: RangeMetric, site: SiteCode, overrides?: RangeOverrides): ReferenceRange {
  const base = DEFAULT_RANGES[metric][site];
  const own = overrides?.[metric]?.[site];
  return own ? { ...base, ...own, source: own.source ?? 'Set by the clinic.' } : base;
}
