import { randomUUID } from 'node:crypto';
import type {
  ClientDetails,
  ClientRecord,
  ClientRow,
  ClientTableQuery,
  ClientTableResponse,
  UpdateClientRequest,
} from '@/shared/protocol/practice';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as repo from '../../repositories/clients-repository';
import { iso } from '../../repositories/sql';
import type { Caller, UseCaseDeps } from '../context';
import { requireFieldWrites } from '../field-access';

const dateOnly = (value: string | Date | null) =>
  value === null ? null : typeof value === 'string' ? value.slice(0, 10) : value.toISOString().slice(0, 10);

const toRow = (c: repo.ClientTableRow): ClientRow => ({
  id: c.id,
  firstName: c.first_name,
  lastName: c.last_name,
  dateOfBirth: dateOnly(c.date_of_birth),
  email: c.email,
  phone: c.phone,
  lastVisit: iso(c.last_visit),
  visits: Number(c.visits),
  hasConsent: c.has_consent,
  nextFollowUp: dateOnly(c.next_follow_up),
  keepUntil: c.keep_until,
  retentionDue: c.retention_due,
});

export const clientNotFound = () => new AppError('not_found', 'There is no such client in this clinic.', 404);

export async function listClientTable(
  deps: UseCaseDeps,
  caller: Caller,
  query: ClientTableQuery,
): Promise<ClientTableResponse> {
  const { rows, total } = await repo.pageClients(deps.sequelize, caller.clinicId, query);
  return { clients: rows.map(toRow), pageInfo: { page: query.page, pageSize: query.pageSize, total } };
}

export async function getClientRecord(
  deps: UseCaseDeps,
  caller: Caller,
  clientId: string,
): Promise<ClientRecord> {
  const client = await repo.findClientRow(deps.sequelize, caller.clinicId, clientId);
  if (!client) throw clientNotFound();
  const [visits, consents, packages] = await Promise.all([
    repo.listVisits(deps.sequelize, caller.clinicId, clientId),
    repo.listConsents(deps.sequelize, caller.clinicId, clientId),
    repo.listPackages(deps.sequelize, caller.clinicId, clientId),
  ]);
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'client.read',
    entity: 'client',
    entityId: clientId,
    ip: caller.ip,
  });
  return {
    client: {
      ...toRow(client),
      notes: client.notes,
      version: client.version,
      createdAt: iso(client.created_at)!,
    },
    visits: visits.map((v) => ({
      sessionId: v.id,
      startedAt: iso(v.started_at)!,
      status: v.status,
      operatorName: v.operator_name,
      followUpDate: dateOnly(v.follow_up_date),
      consentVersion: v.consent_version,
      sitesRecorded: Number(v.sites_recorded),
      paidFromPackage: v.paid_from_package,
    })),
    consents: consents.map((k) => ({
      id: k.id,
      typedName: k.typed_name,
      consentDate: dateOnly(k.consent_date)!,
      textVersion: k.consent_text_version,
      textTitle: k.title,
      recordedAt: iso(k.created_at)!,
    })),
    packages: packages.map((p) => ({
      id: p.id,
      description: p.description,
      visitsTotal: p.visits_total,
      visitsUsed: p.visits_used,
      visitsLeft: p.status === 'active' ? p.visits_total - p.visits_used : 0,
      status: p.status,
      createdAt: iso(p.created_at)!,
    })),
  };
}

const fieldsOf = (input: ClientDetails) => ({
  firstName: input.firstName,
  lastName: input.lastName,
  dateOfBirth: input.dateOfBirth ?? null,
  email: input.email ? input.email.toLowerCase() : null,
  phone: input.phone ?? null,
  notes: input.notes ?? null,
});

export async function createClientRecord(
  deps: UseCaseDeps,
  caller: Caller,
  input: ClientDetails,
): Promise<{ id: string }> {
  const id = randomUUID();
  const fields = fieldsOf(input);
  requireFieldWrites(caller.role, 'clients', Object.keys(fields));
  await deps.sequelize.transaction(async (transaction) => {
    await repo.insertClient(deps.sequelize, { id, clinicId: caller.clinicId, ...fields }, transaction);
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'client.create',
        entity: 'client',
        entityId: id,
        ip: caller.ip,
      },
      transaction,
    );
  });
  return { id };
}

export async function updateClientRecord(
  deps: UseCaseDeps,
  caller: Caller,
  clientId: string,
  input: UpdateClientRequest,
): Promise<void> {
  const fields = fieldsOf(input);
  requireFieldWrites(caller.role, 'clients', Object.keys(fields));
  await deps.sequelize.transaction(async (transaction) => {
    const before = await repo.findClientRow(deps.sequelize, caller.clinicId, clientId, transaction);
    if (!before) throw clientNotFound();
    const changed = await repo.updateClientIfVersion(
      deps.sequelize,
      caller.clinicId,
      clientId,
      input.version,
      fields,
      transaction,
    );
    if (changed === 0) {
      throw new AppError(
        'stale_edit',
        'Someone changed this client since you opened it. Reload to see their change, then edit again.',
        409,
        {
          currentVersion: before.version,
        },
      );
    }
    // Only the names of the fields go to the log, never their values.
    const names: Record<keyof typeof fields, keyof repo.ClientTableRow> = {
      firstName: 'first_name',
      lastName: 'last_name',
      dateOfBirth: 'date_of_birth',
      email: 'email',
      phone: 'phone',
      notes: 'notes',
    };
    const changedFields = (Object.keys(fields) as (keyof typeof fields)[]).filter((k) => {
      const old = before[names[k]];
      const oldValue = k === 'dateOfBirth' ? dateOnly(old as string | null) : old;
      return (oldValue ?? null) !== (fields[k] ?? null);
    });
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'client.update',
        entity: 'client',
        entityId: clientId,
        ip: caller.ip,
        details: { fields: changedFields },
      },
      transaction,
    );
  });
}
