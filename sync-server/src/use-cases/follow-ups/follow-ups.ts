import type { FollowUpDue, ReminderRunResponse } from '@/shared/protocol/practice';
import { runFollowUpReminders } from '../../jobs/follow-up-reminders';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as repo from '../../repositories/follow-ups-repository';
import { iso } from '../../repositories/sql';
import type { Caller, UseCaseDeps } from '../context';

export async function listFollowUpsDue(
  deps: UseCaseDeps,
  caller: Caller,
  withinDays: number,
): Promise<FollowUpDue[]> {
  const rows = await repo.listDue(deps.sequelize, caller.clinicId, withinDays);
  return rows.map((r) => ({
    clientId: r.client_id,
    clientName: r.client_name,
    followUpDate: String(r.follow_up_date).slice(0, 10),
    daysUntil: Number(r.days_until),
    lastVisit: iso(r.last_visit)!,
    reminderStatus: (r.reminder_status ?? 'none') as FollowUpDue['reminderStatus'],
  }));
}

/** The admin's "send due reminders now"; the scheduled job does the same for every clinic. */
export async function runRemindersNow(deps: UseCaseDeps, caller: Caller): Promise<ReminderRunResponse> {
  const result = await runFollowUpReminders(deps.sequelize, deps.services.mail, {
    clinicId: caller.clinicId,
  });
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'follow_up.reminders_run',
    ip: caller.ip,
    details: { ...result },
  });
  return result;
}
