import type { Sequelize, Transaction } from 'sequelize';
import { escapeLike, execute, selectRows } from './sql';

// The audit log (`audit_events`): append-only, enforced by a trigger. Writing takes no connection argument, since
// every use case and middleware records events: it writes on the database the app was built with
// (`useAuditDatabase`, called by `createApp`), or inside the caller's transaction.

let auditDatabase: Sequelize | undefined;

/** The database `recordAuditEvent` writes to; a process talks to one database. */
export function useAuditDatabase(sequelize: Sequelize): void {
  auditDatabase = sequelize;
}

export interface AuditEntry {
  clinicId: string | null;
  userId: string | null;
  action: string;
  entity?: string;
  entityId?: string;
  ip?: string | null;
  details?: Record<string, unknown>;
}

export async function recordAuditEvent(entry: AuditEntry, transaction?: Transaction): Promise<void> {
  if (!auditDatabase) throw new Error('recordAuditEvent() before useAuditDatabase(): build the app first');
  await execute(
    auditDatabase,
    `INSERT INTO audit_events (clinic_id, user_id, action, entity, entity_id, ip, details, occurred_at)
     VALUES (:clinicId, :userId, :action, :entity, :entityId, :ip, CAST(:details AS jsonb), now())`,
    {
      clinicId: entry.clinicId,
      userId: entry.userId,
      action: entry.action,
      entity: entry.entity ?? null,
      entityId: entry.entityId ?? null,
      ip: entry.ip ?? null,
      details: entry.details === undefined ? null : JSON.stringify(entry.details),
    },
    transaction,
  );
}

export type AuditFilter = {
  action?: string;
  userId?: string;
  entity?: string;
  entityId?: string;
  /** Part of the client's name the event concerns (any order of first and last name). */
  client?: string;
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
};

/**
 * The client an event concerns, whatever it names: the client itself, one of their visits or recordings, or a
 * payment. Every lookup stays inside the event's clinic. An erased client keeps their id but no name.
 */
const concerns = `LEFT JOIN LATERAL (
    SELECT CASE
      WHEN a.entity IN ('client', 'clients') THEN a.entity_id
      WHEN a.entity = 'recording_sessions' THEN
        (SELECT s.client_id::text FROM recording_sessions s WHERE s.clinic_id = a.clinic_id AND s.id::text = a.entity_id)
      WHEN a.entity = 'site_recordings' THEN
        (SELECT s.client_id::text FROM site_recordings r JOIN recording_sessions s ON s.id = r.session_id
         WHERE r.clinic_id = a.clinic_id AND r.id::text = a.entity_id)
      WHEN a.entity = 'consents' THEN
        (SELECT c.client_id::text FROM consents c WHERE c.clinic_id = a.clinic_id AND c.id::text = a.entity_id)
      WHEN a.entity = 'payment' THEN coalesce(a.details->>'clientId',
        (SELECT p.client_id::text FROM payments p WHERE p.clinic_id = a.clinic_id AND p.id::text = a.entity_id))
    END AS client_id
  ) about ON true
  LEFT JOIN clients c ON c.clinic_id = a.clinic_id AND c.id::text = about.client_id
  LEFT JOIN users u ON u.id = a.user_id AND u.clinic_id = a.clinic_id
  LEFT JOIN users subject ON a.entity = 'user' AND subject.clinic_id = a.clinic_id AND subject.id::text = a.entity_id
  LEFT JOIN invitations inv ON a.entity = 'invitation' AND inv.clinic_id = a.clinic_id AND inv.id::text = a.entity_id`;

const clientName = `CASE WHEN c.deleted_at IS NULL THEN c.first_name || ' ' || c.last_name END`;

export type AuditEventDbRow = {
  id: string;
  occurred_at: Date;
  user_id: string | null;
  user_name: string | null;
  action: string;
  entity: string | null;
  entity_id: string | null;
  ip: string | null;
  details: Record<string, unknown> | null;
  client_id: string | null;
  client_name: string | null;
  client_erased: boolean;
  subject_name: string | null;
};

export async function pageAuditEvents(sequelize: Sequelize, clinicId: string, f: AuditFilter) {
  const where = `a.clinic_id = :clinicId
    AND (:action::text IS NULL OR a.action = :action OR a.action LIKE :actionPrefix)
    AND (:userId::uuid IS NULL OR a.user_id = :userId)
    AND (:entity::text IS NULL OR a.entity = :entity)
    AND (:entityId::text IS NULL OR a.entity_id = :entityId)
    AND (:client::text IS NULL OR (c.deleted_at IS NULL AND (c.first_name || ' ' || c.last_name ILIKE :client
      OR c.last_name || ' ' || c.first_name ILIKE :client)))
    AND (:from::date IS NULL OR a.occurred_at >= CAST(:from AS date))
    AND (:to::date IS NULL OR a.occurred_at < CAST(:to AS date) + 1)`;
  const r = {
    clinicId,
    action: f.action ?? null,
    actionPrefix: f.action ? `${escapeLike(f.action)}.%` : null,
    userId: f.userId ?? null,
    entity: f.entity ?? null,
    entityId: f.entityId ?? null,
    client: f.client ? `%${escapeLike(f.client.trim().replace(/\s+/g, ' '))}%` : null,
    from: f.from ?? null,
    to: f.to ?? null,
    limit: f.pageSize,
    offset: (f.page - 1) * f.pageSize,
  };
  const [rows, counts] = await Promise.all([
    selectRows<AuditEventDbRow>(
      sequelize,
      `SELECT a.id, a.occurred_at, a.user_id, u.name AS user_name, a.action, a.entity, a.entity_id, a.ip, a.details,
         about.client_id, ${clientName} AS client_name,
         (about.client_id IS NOT NULL AND (c.id IS NULL OR c.deleted_at IS NOT NULL)) AS client_erased,
         coalesce(subject.name, inv.name, inv.email) AS subject_name
       FROM audit_events a ${concerns}
       WHERE ${where} ORDER BY a.occurred_at DESC, a.id DESC LIMIT :limit OFFSET :offset`,
      r,
    ),
    selectRows<{ total: string }>(
      sequelize,
      `SELECT count(*) AS total FROM audit_events a ${concerns} WHERE ${where}`,
      r,
    ),
  ]);
  return { rows, total: Number(counts[0]?.total ?? 0) };
}
