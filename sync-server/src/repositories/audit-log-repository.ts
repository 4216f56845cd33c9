import type { Sequelize } from 'sequelize';
import { selectRows } from './sql';

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
