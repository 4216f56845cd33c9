import type { Role } from '@/shared/protocol';
import type { Sequelize, Transaction } from 'sequelize';
import { execute, selectRows } from './sql';

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

  private select<T extends object>(sql: string, replacements: Record<string, unknown>) {
    return selectRows<T>(this.sequelize, sql, replacements, this.transaction);
  }

  async list(clinicId: string, status: 'open' | 'resolved' | 'all', limit = 200): Promise<ConflictRecord[]> {
    const rows = await this.select<Record<string, unknown>>(
      `${SELECT} WHERE c.clinic_id = :clinicId AND (:status = 'all' OR c.status = :status)
        ORDER BY c.created_at DESC LIMIT :limit`,
      { clinicId, status, limit },
    );
    return rows.map(toRecord);
  }

  async find(clinicId: string, id: string, forUpdate = false): Promise<ConflictRecord | null> {
    // FOR UPDATE cannot sit on the nullable side of an outer join, hence the plain lock first.
    if (forUpdate)
      await this.select(`SELECT 1 FROM sync_conflicts WHERE id = :id AND clinic_id = :clinicId FOR UPDATE`, {
        id,
        clinicId,
      });
    const [raw] = await this.select<Record<string, unknown>>(
      `${SELECT} WHERE c.id = :id AND c.clinic_id = :clinicId`,
      {
        id,
        clinicId,
      },
    );
    return raw ? toRecord(raw) : null;
  }

  async userName(userId: string | null): Promise<string | null> {
    if (!userId) return null;
    const [row] = await this.select<{ name: string }>(`SELECT name FROM users WHERE id = :userId`, {
      userId,
    });
    return row?.name ?? null;
  }

  async userRole(userId: string | null): Promise<Role | null> {
    if (!userId) return null;
    const [row] = await this.select<{ role: Role }>(`SELECT role FROM users WHERE id = :userId`, { userId });
    return row?.role ?? null;
  }

  async markResolved(id: string, resolvedBy: string, resolution: Record<string, unknown>): Promise<void> {
    await execute(
      this.sequelize,
      `UPDATE sync_conflicts SET status = 'resolved', resolution = CAST(:resolution AS jsonb), resolved_by = :resolvedBy,
              resolved_at = now(), updated_at = now()
        WHERE id = :id`,
      { id, resolution: JSON.stringify(resolution), resolvedBy },
      this.transaction,
    );
  }
}
