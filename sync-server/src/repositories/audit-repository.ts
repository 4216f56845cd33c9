import type { Sequelize, Transaction } from 'sequelize';
import { AuditEvent } from '../models';
import { execute, selectRows } from './sql';

// The audit log (`audit_events`): append-only, enforced by a trigger. Writing takes no connection argument, since
// every use case and middleware records events: it writes on the connection the models were set up with.

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
  await execute(
    AuditEvent.sequelize!,
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
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
};

export async function pageAuditEvents(sequelize: Sequelize, clinicId: string, f: AuditFilter) {
  const where = `a.clinic_id = :clinicId
    AND (:action::text IS NULL OR a.action = :action OR a.action LIKE :actionPrefix)
    AND (:userId::uuid IS NULL OR a.user_id = :userId)
    AND (:entity::text IS NULL OR a.entity = :entity)
    AND (:entityId::text IS NULL OR a.entity_id = :entityId)
    AND (:from::date IS NULL OR a.occurred_at >= CAST(:from AS date))
    AND (:to::date IS NULL OR a.occurred_at < CAST(:to AS date) + 1)`;
  const r = {
    clinicId,
    action: f.action ?? null,
    actionPrefix: f.action ? `${f.action.replace(/[\\%_]/g, (c) => `\\${c}`)}.%` : null,
    userId: f.userId ?? null,
    entity: f.entity ?? null,
    entityId: f.entityId ?? null,
    from: f.from ?? null,
    to: f.to ?? null,
    limit: f.pageSize,
    offset: (f.page - 1) * f.pageSize,
  };
  const [rows, counts, actions] = await Promise.all([
    selectRows<{
      id: string;
      occurred_at: Date;
      user_id: string | null;
      user_name: string | null;
      action: string;
      entity: string | null;
      entity_id: string | null;
      ip: string | null;
      details: Record<string, unknown> | null;
    }>(
      sequelize,
      `SELECT a.id, a.occurred_at, a.user_id, u.name AS user_name, a.action, a.entity, a.entity_id, a.ip, a.details
       FROM audit_events a LEFT JOIN users u ON u.id = a.user_id
       WHERE ${where} ORDER BY a.occurred_at DESC, a.id DESC LIMIT :limit OFFSET :offset`,
      r,
    ),
    selectRows<{ total: string }>(
      sequelize,
      `SELECT count(*) AS total FROM audit_events a WHERE ${where}`,
      r,
    ),
    selectRows<{ action: string }>(
      sequelize,
      `SELECT DISTINCT action FROM audit_events WHERE clinic_id = :clinicId ORDER BY action`,
      { clinicId },
    ),
  ]);
  return { rows, total: Number(counts[0]?.total ?? 0), actions: actions.map((a) => a.action) };
}
