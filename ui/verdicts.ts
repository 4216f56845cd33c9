import type { QualityVerdict } from '@/shared/protocol';

/**
 * The words for a take's quality verdict, the same on every screen that shows one. They judge the recording only,
 * never the client.
 */
export const verdictWords: Record<QualityVerdict, { label: string; tone: 'good' | 'caution' | 'danger' }> = {
  good: { label: 'Good', tone: 'good' },
  usable: { label: 'Usable', tone: 'caution' },
  retake: { label: 'Retake', tone: 'danger' },
};
