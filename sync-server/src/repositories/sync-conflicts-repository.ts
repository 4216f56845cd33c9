import type { Role } from '@/shared/protocol';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

export interface ConflictRecord {
  id: string;
  clinicId: string;
  entity: string;
  rowId: string;
  mutationId: string | null;
  deviceId: string | null;
  userId: string | null;
  userName: string | null;
  serverVersion: Record<string, unknown>;
  clientVersion: Record<string, unknown>;
  status: 'open' | 'resolved';
  resolution: Record<string, unknown> | null;
  resolvedBy: string | null;
  resolvedByName: string | null;
  resolvedAt: string | null;
  createdAt: string;
}

const SELECT = `SELECT c.*, u.name AS user_name, r.name AS resolved_by_name
  FROM sync_conflicts c LEFT JOIN users u ON u.id = c.user_id LEFT JOIN users r ON r.id = c.resolved_by`;

const iso = (v: unknown) =>
  v instanceof Date ? v.toISOString() : v === null || v === undefined ? null : String(v);

function toRecord(raw: Record<string, unknown>): ConflictRecord {
  return {
    id: String(raw.id),
    clinicId: String(raw.clinic_id),
    entity: String(raw.entity),
    rowId: String(raw.row_id),
    mutationId: (raw.mutation_id as string | null) ?? null,
    deviceId: (raw.device_id as string | null) ?? null,
    userId: (raw.user_id as string | null) ?? null,
    userName: (raw.user_name as string | null) ?? null,
    serverVersion: raw.server_version as Record<string, unknown>,
    clientVersion: raw.client_version as Record<string, unknown>,
    status: raw.status as 'open' | 'resolved',
    resolution: (raw.resolution as Record<string, unknown> | null) ?? null,
    resolvedBy: (raw.resolved_by as string | null) ?? null,
    resolvedByName: (raw.resolved_by_name as string | null) ?? null,
    resolvedAt: iso(raw.resolved_at),
    createdAt: iso(raw.created_at)!,
  };
}

export class SyncConflictsRepository {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly transaction?: Transaction,
  ) {}

  async list(clinicId: string, status: 'open' | 'resolved' | 'all', limit = 200): Promise<ConflictRecord[]> {
    const filter = status === 'all' ? '' : 'AND c.status = $2';
    const rows = await this.sequelize.query<Record<string, unknown>>(
      `${SELECT} WHERE c.clinic_id = $1 ${filter} ORDER BY c.created_at DESC LIMIT ${Number(limit)}`,
      {
        bind: status === 'all' ? [clinicId] : [clinicId, status],
        type: QueryTypes.SELECT,
        transaction: this.transaction,
      },
    );
    return rows.map(toRecord);
  }

  async find(clinicId: string, id: string, forUpdate = false): Promise<ConflictRecord | null> {
    // FOR UPDATE cannot sit on the nullable side of an outer join, hence the plain lock first.
    if (forUpdate) {
      await this.sequelize.query(`SELECT 1 FROM sync_conflicts WHERE id = $1 AND clinic_id = $2 FOR UPDATE`, {
        bind: [id, clinicId],
        transaction: this.transaction,
      });
    }
    const [raw] = await this.sequelize.query<Record<string, unknown>>(
      `${SELECT} WHERE c.id = $1 AND c.clinic_id = $2`,
      {
        bind: [id, clinicId],
        type: QueryTypes.SELECT,
        transaction: this.transaction,
      },
    );
    return raw ? toRecord(raw) : null;
  }

  async userName(userId: string | null): Promise<string | null> {
    if (!userId) return null;
    const [row] = await this.sequelize.query<{ name: string }>(`SELECT name FROM users WHERE id = $1`, {
      bind: [userId],
      type: QueryTypes.SELECT,
      transaction: this.transaction,
    });
    return row?.name ?? null;
  }

  async userRole(userId: string | null): Promise<Role | null> {
    if (!userId) return null;
    const [row] = await this.sequelize.query<{ role: Role }>(`SELECT role FROM users WHERE id = $1`, {
      bind: [userId],
      type: QueryTypes.SELECT,
      transaction: this.transaction,
    });
    return row?.role ?? null;
  }

  async markResolved(id: string, resolvedBy: string, resolution: Record<string, unknown>): Promise<void> {
    await this.sequelize.query(
      `UPDATE sync_conflicts SET status = 'resolved', resolution = $2::jsonb, resolved_by = $3, resolved_at = now(), updated_at = now() WHERE id = $1`,
      { bind: [id, JSON.stringify(resolution), resolvedBy], transaction: this.transaction },
    );
  }
}
