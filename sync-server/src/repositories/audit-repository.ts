import type { Transaction } from 'sequelize';
import { AuditEvent } from '../models';

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
  await AuditEvent.create(
    {
      clinicId: entry.clinicId,
      userId: entry.userId,
      action: entry.action,
      entity: entry.entity ?? null,
      entityId: entry.entityId ?? null,
      ip: entry.ip ?? null,
      details: entry.details ?? null,
    },
    { transaction },
  );
}

export async function listAuditEvents(clinicId: string, limit = 100) {
  const rows = await AuditEvent.findAll({ where: { clinicId }, order: [['id', 'DESC']], limit });
  return rows.map((r) => r.get({ plain: true }));
}
