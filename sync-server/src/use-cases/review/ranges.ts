import type { Sequelize } from 'sequelize';
import type { Site } from '@/shared/protocol';
import { DEFAULT_RANGES, rangeFor, type RangeMetric, type RangeOverrides } from '@/shared/ranges';
import { listRangeOverrides } from '../../repositories/settings-repository';
import type { Range, RangeLookup } from './measurements';

const isMetric = (key: string): key is RangeMetric => key in DEFAULT_RANGES;
const numberOrNull = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/** The clinic's ranges (its own limits over the defaults of shared/ranges); the screens, the list filter and the report all use this. */
export async function rangesForClinic(sequelize: Sequelize, clinicId: string): Promise<RangeLookup> {
  const overrides: RangeOverrides = {};
  for (const row of await listRangeOverrides(sequelize, clinicId)) {
    if (!isMetric(row.metric)) continue;
    const bySite = (overrides[row.metric] ??= {});
    bySite[row.site as Site] = { low: numberOrNull(row.low), high: numberOrNull(row.high) };
  }
  return (key: string, site: Site): Range | null => {
    if (!isMetric(key)) return null;
    const r = rangeFor(key, site, overrides);
    return { low: r.low, high: r.high, source: r.source };
  };
}
