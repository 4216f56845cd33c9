import type { Sequelize, Transaction } from 'sequelize';
import { execute, selectRows } from './sql';

/** Each client's latest follow-up date, when no visit has happened since the visit that set it. */
export const listDue = (sequelize: Sequelize, clinicId: string, withinDays: number) =>
  selectRows<{
    client_id: string;
    client_name: string;
    follow_up_date: string;
    days_until: number;
    last_visit: Date;
    reminder_status: string | null;
  }>(
    sequelize,
    `WITH latest AS (
       SELECT DISTINCT ON (s.client_id) s.client_id, s.follow_up_date, s.started_at
       FROM recording_sessions s
       WHERE s.clinic_id = :clinicId AND s.deleted_at IS NULL AND s.status <> 'cancelled'
       ORDER BY s.client_id, s.started_at DESC)
     SELECT l.client_id, concat_ws(' ', c.first_name, c.last_name) AS client_name, l.follow_up_date,
       (l.follow_up_date - current_date) AS days_until, l.started_at AS last_visit, r.status AS reminder_status
     FROM latest l JOIN clients c ON c.id = l.client_id AND c.deleted_at IS NULL
     LEFT JOIN follow_up_reminders r ON r.client_id = l.client_id AND r.follow_up_date = l.follow_up_date
     WHERE l.follow_up_date IS NOT NULL AND l.follow_up_date <= current_date + :withinDays
     ORDER BY l.follow_up_date, client_name`,
    { clinicId, withinDays },
  );

/**
 * Makes one reminder row per client and follow-up date that falls within each clinic's notice period. The
 * unique key means a second run, or a second server, adds nothing. "Today" is each clinic's own (in its time
 * zone) unless a day is given.
 */
export const queueReminders = (sequelize: Sequelize, today: string | null, clinicId: string | null) =>
  execute(
    sequelize,
    `INSERT INTO follow_up_reminders (id, clinic_id, client_id, session_id, follow_up_date)
     SELECT gen_random_uuid(), s.clinic_id, s.client_id, s.id, s.follow_up_date
     FROM (SELECT DISTINCT ON (s.client_id) s.* FROM recording_sessions s
           WHERE s.deleted_at IS NULL AND s.status <> 'cancelled' AND (:clinicId::uuid IS NULL OR s.clinic_id = :clinicId)
           ORDER BY s.client_id, s.started_at DESC) s
     JOIN clients c ON c.id = s.client_id AND c.deleted_at IS NULL AND c.email IS NOT NULL
     LEFT JOIN clinic_settings cs ON cs.clinic_id = s.clinic_id
     CROSS JOIN LATERAL (SELECT coalesce(CAST(:today AS date),
                                         (now() AT TIME ZONE coalesce(cs.time_zone, 'UTC'))::date) AS today) d
     WHERE s.follow_up_date IS NOT NULL AND s.follow_up_date >= d.today
       AND s.follow_up_date - coalesce(cs.reminder_days_before, 3) <= d.today
     ON CONFLICT (client_id, follow_up_date) DO NOTHING`,
    { today, clinicId },
  );

export type ClaimedReminder = {
  id: string;
  clinic_id: string;
  follow_up_date: string;
  attempts: number;
  email: string;
  first_name: string;
  clinic_name: string;
  address: string | null;
};

/**
 * Claims reminders to send in one transaction: pending ones, and ones whose sender stopped half-way long ago.
 * SKIP LOCKED means two job runs at once never claim the same row.
 */
export const claimReminders = (
  sequelize: Sequelize,
  staleBefore: Date,
  limit: number,
  transaction: Transaction,
) =>
  selectRows<ClaimedReminder>(
    sequelize,
    `WITH claimed AS (
       UPDATE follow_up_reminders r SET status = 'sending', claimed_at = now(), attempts = attempts + 1, updated_at = now()
       WHERE r.id IN (SELECT id FROM follow_up_reminders
                      WHERE status = 'pending' OR (status = 'sending' AND claimed_at < :staleBefore)
                      ORDER BY follow_up_date LIMIT :limit FOR UPDATE SKIP LOCKED)
       RETURNING r.*)
     SELECT claimed.id, claimed.clinic_id, claimed.follow_up_date, claimed.attempts, c.email, c.first_name, k.name AS clinic_name, cs.address
     FROM claimed JOIN clients c ON c.id = claimed.client_id JOIN clinics k ON k.id = claimed.clinic_id
     LEFT JOIN clinic_settings cs ON cs.clinic_id = claimed.clinic_id`,
    { staleBefore, limit },
    transaction,
  );

export const markReminderSent = (sequelize: Sequelize, id: string, messageId: string) =>
  execute(
    sequelize,
    `UPDATE follow_up_reminders SET status = 'sent', sent_at = now(), message_id = :messageId, last_error = NULL, updated_at = now()
     WHERE id = :id AND status = 'sending'`,
    { id, messageId },
  );

export const markReminderFailed = (sequelize: Sequelize, id: string, error: string, giveUp: boolean) =>
  execute(
    sequelize,
    `UPDATE follow_up_reminders SET status = :status, last_error = :error, updated_at = now() WHERE id = :id AND status = 'sending'`,
    { id, error, status: giveUp ? 'failed' : 'pending' },
  );
