import type { ReviewNotes, SaveNotesRequest } from '@/shared/protocol/review';
import { DOCUMENT_LOCALE, formatDay, todayIn } from '@/shared/format/dates';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import { findSessionRecord, updateNotesIfVersion } from '../../repositories/review-repository';
import type { Caller, UseCaseDeps } from '../context';
import { requireFieldWrites } from '../field-access';
import { clinicTimeZone } from '../settings/settings';
import { notesOf, sessionNotFound } from './session-view';

/**
 * Saves findings, plan and follow-up date only over the version the practitioner read. A save based on an
 * older version is refused with both versions, so nothing anyone wrote is lost without a person choosing.
 */
export async function saveNotes(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  request: SaveNotesRequest,
): Promise<ReviewNotes> {
  const clean = (v: string | null) => (v && v.trim() ? v : null);
  const values = {
    findings: clean(request.findings),
    plan: clean(request.plan),
    followUpDate: request.followUpDate,
    reviewedBy: caller.userId,
  };
  // The save also moves a completed session to reviewed; reviewedBy and reviewedAt are the server's.
  requireFieldWrites(caller.role, 'recording_sessions', ['findings', 'plan', 'followUpDate', 'status']);
  const today = todayIn(await clinicTimeZone(deps, caller.clinicId));
  return deps.sequelize.transaction(async (transaction) => {
    const before = await findSessionRecord(deps.sequelize, caller.clinicId, sessionId, transaction);
    if (!before) throw sessionNotFound();
    // A new follow-up is a day after today at the clinic; one saved earlier may stay while other fields change.
    if (
      values.followUpDate &&
      values.followUpDate !== notesOf(before).followUpDate &&
      values.followUpDate <= today
    )
      throw new AppError(
        'follow_up_not_after_today',
        `A follow-up date must be after today (${formatDay(today, { locale: DOCUMENT_LOCALE, timeZone: 'UTC' })} at the clinic).`,
        400,
      );
    const saved = await updateNotesIfVersion(
      deps.sequelize,
      caller.clinicId,
      sessionId,
      request.baseVersion,
      values,
      transaction,
    );
    const current = await findSessionRecord(deps.sequelize, caller.clinicId, sessionId, transaction);
    if (!current) throw sessionNotFound();
    if (!saved) {
      throw new AppError(
        'stale_edit',
        'Someone saved this session after you opened it. Compare both and save again.',
        409,
        { current: notesOf(current), yours: request },
      );
    }
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'review.findings.save',
        entity: 'recording_sessions',
        entityId: sessionId,
        ip: caller.ip,
        details: {
          fromVersion: request.baseVersion,
          toVersion: saved.version,
          followUpDate: values.followUpDate,
        },
      },
      transaction,
    );
    return notesOf(current);
  });
}
