// Sends the follow-up reminder e-mails. At least once: a claimed row whose sender died is claimed again after
// STALE_MS. Never twice for the same reminder: the row is unique per client and date, a run claims it (status
// 'sending') in a committed transaction before the message goes out, and a sent row is never claimed again.
import type { Sequelize } from 'sequelize';
import { cautionText } from '@/shared/cautions';
import { DOCUMENT_LOCALE, formatDay } from '@/shared/format/dates';
import * as repo from '../repositories/follow-ups-repository';
import type { MailService } from '../services/mail';
import { MailSendError } from '../services/mail';

export const STALE_MS = 15 * 60 * 1000;
const MAX_ATTEMPTS = 5;

export type ReminderRun = { queued: number; sent: number; failed: number };

export async function runFollowUpReminders(
  sequelize: Sequelize,
  mail: MailService,
  options: { today?: string; clinicId?: string; batch?: number } = {},
): Promise<ReminderRun> {
  const queued = await repo.queueReminders(sequelize, options.today ?? null, options.clinicId ?? null);
  let sent = 0;
  let failed = 0;
  for (;;) {
    const claimed = await sequelize.transaction((t) =>
      repo.claimReminders(sequelize, new Date(Date.now() - STALE_MS), options.batch ?? 25, t),
    );
    if (claimed.length === 0) break;
    for (const r of claimed) {
      try {
        const result = await mail.send({
          clinicId: r.clinic_id,
          to: r.email,
          subject: `Your follow-up visit at ${r.clinic_name}`,
          text: [
            `Hello ${r.first_name},`,
            '',
            `This is a reminder that your follow-up visit at ${r.clinic_name} is due on ${formatDay(String(r.follow_up_date).slice(0, 10), { locale: DOCUMENT_LOCALE, timeZone: 'UTC' })}.`,
            'Please contact the clinic to book a time if you have not done so yet.',
            ...(r.address ? ['', r.clinic_name, r.address] : []),
            '',
            cautionText,
          ].join('\n'),
        });
        await repo.markReminderSent(sequelize, r.id, result.messageId);
        sent += 1;
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        const permanent = error instanceof MailSendError && !error.temporary;
        await repo.markReminderFailed(sequelize, r.id, message, permanent || r.attempts >= MAX_ATTEMPTS);
        failed += 1;
      }
    }
    // A failed row went back to pending: leave it for the next run rather than retrying it at once.
    if (failed > 0 || claimed.length < (options.batch ?? 25)) break;
  }
  return { queued, sent, failed };
}
