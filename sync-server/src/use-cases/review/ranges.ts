import type { Site } from '@/shared/protocol';
import type { Range, RangeLookup } from './measurements';

// Adult resting heart rate 60–100 bpm: the band in general clinical use (common practice, no source; from memory).
const fallback: Record<string, Range> = {
  heartRateBpm: {
    low: 60,
    high: 100,
    source: 'Adult resting heart rate, 60–100 bpm (common practice, no source)',
  },
};

/** The clinic's ranges for the review; the same lookup feeds the screens, the list filter and the report. */
export async function rangesForClinic(_clinicId: string): Promise<RangeLookup> {
  return (key: string, _site: Site) => fallback[key] ?? null;
}
