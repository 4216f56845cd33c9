import type { AuditListResponse } from '@/shared/protocol/practice';
import { pageAuditEvents, type AuditFilter } from '../../repositories/audit-repository';
import { iso } from '../../repositories/sql';
import type { Caller, UseCaseDeps } from '../context';

/** Read-only by design: the API has no route that changes or removes an audit row, and the table refuses it too. */
export async function readAuditLog(
  deps: UseCaseDeps,
  caller: Caller,
  filter: AuditFilter,
): Promise<AuditListResponse> {
  const { rows, total } = await pageAuditEvents(deps.sequelize, caller.clinicId, filter);
  return {
    events: rows.map((r) => ({
      id: String(r.id),
      occurredAt: iso(r.occurred_at)!,
      userId: r.user_id,
      userName: r.user_name,
      action: r.action,
      entity: r.entity,
      entityId: r.entity_id,
      ip: r.ip,
      details: r.details,
      clientId: r.client_id,
      clientName: r.client_name,
      clientErased: r.client_erased,
      subjectName: r.subject_name,
    })),
    pageInfo: { page: filter.page, pageSize: filter.pageSize, total },
  };
}
