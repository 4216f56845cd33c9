import type { Sequelize } from 'sequelize';
import { selectRows } from './sql';
import type { ReportMail } from '@/shared/protocol/review';

type Row = {
  id: string;
  session_id: string;
  to_address: string;
  subject: string;
  state: ReportMail['state'];
  attempts: number;
  last_error: string | null;
  next_attempt_at: string | null;
  created_at: string;
  sent_at: string | null;
};

const toMail = (r: Row): ReportMail => ({
  id: r.id,
  sessionId: r.session_id,
  to: r.to_address,
  subject: r.subject,
  state: r.state,
  attempts: Number(r.attempts),
  lastError: r.last_error,
  nextAttemptAt: r.next_attempt_at ? new Date(r.next_attempt_at).toISOString() : null,
  createdAt: new Date(r.created_at).toISOString(),
  sentAt: r.sent_at ? new Date(r.sent_at).toISOString() : null,
});

const COLUMNS =
  'id, session_id, to_address, subject, state, attempts, last_error, next_attempt_at, created_at, sent_at';

export type NewReportMail = {
  id: string;
  clinicId: string;
  sessionId: string;
  compareSessionId: string | null;
  to: string;
  subject: string;
  bodyText: string;
  attachmentName: string;
  attachment: Buffer;
  createdBy: string;
};

export async function insertReportMail(sequelize: Sequelize, mail: NewReportMail): Promise<ReportMail> {
  const rows = await selectRows<Row>(
    sequelize,
    `INSERT INTO report_mails (id, clinic_id, session_id, compare_session_id, to_address, subject, body_text, attachment_name, attachment, created_by)
     VALUES (:id, :clinicId, :sessionId, :compareSessionId, :to, :subject, :bodyText, :attachmentName, :attachment, :createdBy)
     RETURNING ${COLUMNS}`,
    { ...mail },
  );
  return toMail(rows[0]);
}

type ClaimedRow = Row & { clinic_id: string; body_text: string; attachment_name: string; attachment: Buffer };

/** A mail taken for one send attempt, with what the message carries. */
export type ClaimedReportMail = {
  clinicId: string;
  mail: ReportMail;
  bodyText: string;
  attachmentName: string;
  attachment: Buffer;
};

const toClaimed = (r: ClaimedRow): ClaimedReportMail => ({
  clinicId: r.clinic_id,
  mail: toMail(r),
  bodyText: r.body_text,
  attachmentName: r.attachment_name,
  attachment: r.attachment,
});

const CLAIM_RETURNING = `RETURNING ${COLUMNS}, clinic_id, body_text, attachment_name, attachment`;

/** Takes the mail for one send attempt; null if it is already sent or another attempt holds it. */
export async function claimReportMail(
  sequelize: Sequelize,
  clinicId: string,
  mailId: string,
): Promise<ClaimedReportMail | null> {
  const rows = await selectRows<ClaimedRow>(
    sequelize,
    `UPDATE report_mails SET state = 'sending', attempts = attempts + 1, next_attempt_at = NULL, updated_at = now()
      WHERE clinic_id = :clinicId AND id = :mailId AND state IN ('queued', 'failed')
      ${CLAIM_RETURNING}`,
    { clinicId, mailId },
  );
  return rows[0] ? toClaimed(rows[0]) : null;
}

/**
 * Takes, across clinics, the failed mails whose next attempt is due and the ones a sender has held since
 * `staleBefore`. Rows another run is taking are skipped, so two runs never send the same mail.
 */
export async function claimDueReportMails(
  sequelize: Sequelize,
  options: { now: Date; staleBefore: Date; limit: number; clinicId?: string | null },
): Promise<ClaimedReportMail[]> {
  const rows = await selectRows<ClaimedRow>(
    sequelize,
    `UPDATE report_mails SET state = 'sending', attempts = attempts + 1, next_attempt_at = NULL, updated_at = now()
      WHERE id IN (
        SELECT id FROM report_mails
         WHERE ((state = 'failed' AND next_attempt_at <= :now) OR (state = 'sending' AND updated_at < :staleBefore))
           AND (CAST(:clinicId AS uuid) IS NULL OR clinic_id = :clinicId)
         ORDER BY created_at LIMIT :limit FOR UPDATE SKIP LOCKED)
      ${CLAIM_RETURNING}`,
    { ...options, clinicId: options.clinicId ?? null },
  );
  return rows.map(toClaimed);
}

export async function finishReportMail(
  sequelize: Sequelize,
  clinicId: string,
  mailId: string,
  outcome:
    { state: 'sent'; messageId: string } | { state: 'failed'; error: string; nextAttemptAt: Date | null },
): Promise<ReportMail> {
  const rows = await selectRows<Row>(
    sequelize,
    `UPDATE report_mails
        SET state = :state, updated_at = now(),
            message_id = CASE WHEN :state = 'sent' THEN :messageId ELSE message_id END,
            sent_at = CASE WHEN :state = 'sent' THEN now() ELSE sent_at END,
            last_error = CASE WHEN :state = 'failed' THEN :error ELSE NULL END,
            next_attempt_at = CASE WHEN :state = 'failed' THEN CAST(:nextAttemptAt AS timestamptz) ELSE NULL END
      WHERE clinic_id = :clinicId AND id = :mailId
      RETURNING ${COLUMNS}`,
    {
      clinicId,
      mailId,
      state: outcome.state,
      messageId: outcome.state === 'sent' ? outcome.messageId : null,
      error: outcome.state === 'failed' ? outcome.error : null,
      nextAttemptAt: outcome.state === 'failed' ? outcome.nextAttemptAt : null,
    },
  );
  return toMail(rows[0]);
}

export async function findReportMail(
  sequelize: Sequelize,
  clinicId: string,
  mailId: string,
): Promise<ReportMail | null> {
  const rows = await selectRows<Row>(
    sequelize,
    `SELECT ${COLUMNS} FROM report_mails WHERE clinic_id = :clinicId AND id = :mailId`,
    { clinicId, mailId },
  );
  return rows[0] ? toMail(rows[0]) : null;
}

export async function listReportMails(
  sequelize: Sequelize,
  clinicId: string,
  sessionId: string,
): Promise<ReportMail[]> {
  const rows = await selectRows<Row>(
    sequelize,
    `SELECT ${COLUMNS} FROM report_mails WHERE clinic_id = :clinicId AND session_id = :sessionId ORDER BY created_at DESC`,
    { clinicId, sessionId },
  );
  return rows.map(toMail);
}
