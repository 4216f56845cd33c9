import type { BadgeTone } from '@/ui/badge';
import { verdictWords } from '@/ui/verdicts';
import type { SiteVerdict } from '@/shared/protocol';

export function siteVerdictLook(v: SiteVerdict): { label: string; tone: BadgeTone } {
  // Quality of the recording only (ui/verdicts.ts); never a finding about the client.
  if (v.skipped) return { label: 'Skipped', tone: 'neutral' };
  if (!v.verdict) return { label: 'Not recorded', tone: 'neutral' };
  return verdictWords[v.verdict];
}
