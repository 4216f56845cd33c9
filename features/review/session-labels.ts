import type { BadgeTone } from '@/ui/badge';
import type { QualityVerdict, SessionStatus, SiteVerdict } from '@/shared/protocol';

export const statusLabels: Record<SessionStatus, { label: string; tone: BadgeTone }> = {
  in_progress: { label: 'In progress', tone: 'neutral' },
  completed: { label: 'Ready for review', tone: 'caution' },
  reviewed: { label: 'Reviewed', tone: 'good' },
  cancelled: { label: 'Cancelled', tone: 'neutral' },
};

// Quality of the recording only; never a finding about the client.
const verdictTones: Record<QualityVerdict, BadgeTone> = { good: 'good', usable: 'caution', retake: 'danger' };

export function siteVerdictLook(v: SiteVerdict): { label: string; tone: BadgeTone } {
  if (v.skipped) return { label: 'skipped', tone: 'neutral' };
  if (!v.verdict) return { label: 'not recorded', tone: 'neutral' };
  return { label: v.verdict, tone: verdictTones[v.verdict] };
}
