import type { BadgeTone } from '@/ui/badge';
import type { QualityVerdict, SiteVerdict } from '@/shared/protocol';
import { visitStatusWords } from '@/ui/status-words';

/** The visit's state in the words every role reads (ui/status-words.ts). */
export const statusLabels = visitStatusWords;

// Quality of the recording only; never a finding about the client.
const verdictTones: Record<QualityVerdict, BadgeTone> = { good: 'good', usable: 'caution', retake: 'danger' };

export function siteVerdictLook(v: SiteVerdict): { label: string; tone: BadgeTone } {
  if (v.skipped) return { label: 'skipped', tone: 'neutral' };
  if (!v.verdict) return { label: 'not recorded', tone: 'neutral' };
  return { label: v.verdict, tone: verdictTones[v.verdict] };
}
