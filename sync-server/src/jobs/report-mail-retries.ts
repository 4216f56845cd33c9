// Sends report e-mails again that failed on a temporary error (a busy or unreachable relay), after growing waits,
// and takes back any whose sender died half-way. At least once, never twice: a run claims each mail (state
// 'sending') in one committed statement that skips rows another run holds, and a sent mail is never claimed.
// A refusal the relay calls permanent (a 5xx) waits for a person: the session view shows it with a Retry button.
import type { Sequelize } from 'sequelize';
import { claimDueReportMails } from '../repositories/review-mails-repository';
import type { MailService } from '../services/mail';
import { deliverClaimedReportMail } from '../use-cases/review/report';

/** A mail whose sender has held it this long without an answer is taken again. */
export const SENDING_STALE_MS = 10 * 60 * 1000;

export type ReportMailRetryRun = { sent: number; failed: number };

export async function runReportMailRetries(
  sequelize: Sequelize,
  mail: MailService,
  options: { now?: Date; batch?: number; clinicId?: string } = {},
): Promise<ReportMailRetryRun> {
  const now = options.now ?? new Date();
  const claimed = await claimDueReportMails(sequelize, {
    now,
    staleBefore: new Date(now.getTime() - SENDING_STALE_MS),
    limit: options.batch ?? 20,
    clinicId: options.clinicId,
  });
  let sent = 0;
  let failed = 0;
  for (const c of claimed) {
    const result = await deliverClaimedReportMail(sequelize, mail, c, { userId: null, ip: null, now });
    if (result.state === 'sent') sent += 1;
    else failed += 1;
  }
  return { sent, failed };
}
