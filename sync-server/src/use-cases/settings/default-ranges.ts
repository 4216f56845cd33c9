import { siteSchema } from '@/shared/protocol/clinic';
import type { ClinicRange } from '@/shared/protocol/practice';
import { DEFAULT_RANGES, type RangeMetric } from '@/shared/ranges';
import { measurementDefs } from '../review/measurements';

export type DefaultRange = Pick<
  ClinicRange,
  'metric' | 'label' | 'unit' | 'site' | 'low' | 'high' | 'source'
>;

// The same names the review screens give these measurements; a metric without one there keeps its key.
const labelOf = (metric: string) => measurementDefs.find((d) => d.key === metric)?.label ?? metric;

/** The defaults with their sources, one per measurement and site, read from shared/ranges. */
export function defaultRanges(): DefaultRange[] {
  return (Object.keys(DEFAULT_RANGES) as RangeMetric[]).flatMap((metric) =>
    siteSchema.options.map((site) => {
      const r = DEFAULT_RANGES[metric][site];
      return {
        metric,
        label: labelOf(metric),
        unit: r.unit,
        site,
        low: r.low,
        high: r.high,
        source: r.source,
      };
    }),
  );
}
