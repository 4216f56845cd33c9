import type { SessionReferral, SetReferralFlagRequest } from '@/shared/protocol/review';
import { recordAuditEvent } from '../../repositories/audit-repository';
import {
  deleteReferralFlag,
  findReferralFlag,
  upsertReferralFlag,
} from '../../repositories/review-repository';
import type { Caller, UseCaseDeps } from '../context';
import { loadSession, reviewSitesOf } from './session-view';

/**
 * The practitioner adds their own referral flag with a note, or clears it with a note saying why. The flags that
 * the analysis raises (a possible murmur, an irregular rhythm, a rate out of range) stay while the analysis says
 * so: the cautions require those to read "refer to a licensed clinician" wherever they appear.
 */
export async function setReferralFlag(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  request: SetReferralFlagRequest,
): Promise<SessionReferral> {
  await loadSession(deps, caller, sessionId);
  await deps.sequelize.transaction(async (transaction) => {
    const before = await findReferralFlag(deps.sequelize, caller.clinicId, sessionId, transaction);
    if (request.flagged) {
      await upsertReferralFlag(
        deps.sequelize,
        { clinicId: caller.clinicId, sessionId, note: request.note, flaggedBy: caller.userId },
        transaction,
      );
    } else {
      await deleteReferralFlag(deps.sequelize, caller.clinicId, sessionId, transaction);
    }
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: request.flagged ? 'review.referral.flag' : 'review.referral.clear',
        entity: 'recording_sessions',
        entityId: sessionId,
        ip: caller.ip,
        details: { note: request.note, previousNote: before?.note ?? null },
      },
      transaction,
    );
  });
  return (await reviewSitesOf(deps, caller, sessionId)).referral;
}
