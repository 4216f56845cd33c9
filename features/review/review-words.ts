import type { BadgeTone } from '@/ui/badge';
import { verdictWords } from '@/ui/verdicts';
import { referToClinician } from '@/shared/cautions';
import type { QualityVerdict } from '@/shared/protocol';
import type { Measurement, MurmurScreen, ReviewSite } from '@/shared/protocol/review';

// The words each result reads in wherever it appears on the practitioner's screens, with a colour that only
// repeats what the words say.

/** The recording's quality in the product's one verdict vocabulary (ui/verdicts.ts), named as the recording's. */
export function recordingWords(verdict: QualityVerdict): { label: string; tone: BadgeTone } {
  const words = verdictWords[verdict];
  return { label: `Recording: ${words.label}`, tone: words.tone };
}

export function murmurWords(screen: MurmurScreen | null): { label: string; tone: BadgeTone } {
  if (!screen) return { label: 'Murmur screen not run', tone: 'neutral' };
  if (screen.murmur === 'possible') return { label: `Possible murmur: ${referToClinician}`, tone: 'danger' };
  if (screen.murmur === 'unlikely') return { label: 'No murmur pattern found', tone: 'good' };
  return { label: 'Could not tell', tone: 'caution' };
}

export const isOutOfRange = (m: Measurement) => m.status === 'above' || m.status === 'below';

export function outOfRangeWords(site: ReviewSite): { label: string; tone: BadgeTone } {
  const measured = site.measurements.filter((m) => m.status !== 'no_value');
  const out = site.measurements.filter(isOutOfRange).length;
  if (measured.length === 0) return { label: 'Nothing measured', tone: 'neutral' };
  if (out === 0) return { label: 'All measures in range', tone: 'good' };
  return { label: `${out} ${out === 1 ? 'measure' : 'measures'} out of range`, tone: 'caution' };
}

/** The measures a practitioner reads first; the rest sit behind "More measures". */
export const keyMeasureKeys = [
  'heartRateBpm',
  's1s2PeakRatio',
  'systoleDiastoleRatio',
  'systolicActivity',
  'diastolicActivity',
] as const;
