import type { BadgeTone } from '@/ui/badge';
import type { FollowUpDue } from '@/shared/protocol/practice';

const days = (n: number) => `${n} ${n === 1 ? 'day' : 'days'}`;

/** When a follow-up falls, counted from today in the clinic's words: overdue ones first catch the eye. */
export function dueWords(daysUntil: number): { label: string; tone: BadgeTone } {
  if (daysUntil < 0) return { label: `${days(-daysUntil)} overdue`, tone: 'danger' };
  if (daysUntil === 0) return { label: 'Due today', tone: 'caution' };
  if (daysUntil === 1) return { label: 'Due tomorrow', tone: 'caution' };
  return { label: `In ${days(daysUntil)}`, tone: 'neutral' };
}

export const reminderWords: Record<FollowUpDue['reminderStatus'], { label: string; tone: BadgeTone }> = {
  none: { label: 'No reminder yet', tone: 'neutral' },
  pending: { label: 'Reminder waiting to go', tone: 'neutral' },
  sending: { label: 'Reminder going out', tone: 'neutral' },
  sent: { label: 'Reminder sent', tone: 'good' },
  failed: { label: 'Reminder not delivered', tone: 'caution' },
};
