import type { ClinicRange } from '@/shared/protocol/practice';

export type DefaultRange = Pick<
  ClinicRange,
  'metric' | 'label' | 'unit' | 'site' | 'low' | 'high' | 'source'
>;

/** The defaults with their sources, read from shared/ranges (owned by the analysis side). */
export function defaultRanges(): DefaultRange[] {
  return [];
}
