import type { Sequelize, Transaction } from 'sequelize';
import type { ClientSummary } from '@/shared/protocol';
import type { ClientTableQuery } from '@/shared/protocol/practice';
import { escapeLike, execute, iso, selectRows } from './sql';
import { DEFAULT_RETENTION_MONTHS } from './settings-repository';

// The `clients` table: the operators' search (`listClients`), the admin's client records and the client page.

const SEARCH_LIMIT = 200;

/** The clinic's clients whose name or e-mail holds `q`, each with their newest consent. */
export async function listClients(
  sequelize: Sequelize,
  clinicId: string,
  q?: string,
): Promise<ClientSummary[]> {
  const search = q?.trim() ? `%${escapeLike(q.trim())}%` : null;
  const rows = await selectRows<{
    id: string;
    first_name: string;
    last_name: string;
    date_of_birth: string | null;
    email: string | null;
    updated_at: Date;
    consent_id: string | null;
    typed_name: string | null;
    consent_date: string | null;
    consent_text_version: number | null;
    consent_version: number | null;
  }>(
    sequelize,
    `SELECT c.id, c.first_name, c.last_name, to_char(c.date_of_birth, 'YYYY-MM-DD') AS date_of_birth, c.email,
       c.updated_at, k.id AS consent_id, k.typed_name, to_char(k.consent_date, 'YYYY-MM-DD') AS consent_date,
       k.consent_text_version, k.version AS consent_version
     FROM clients c
     LEFT JOIN LATERAL (
       SELECT k.id, k.typed_name, k.consent_date, k.consent_text_version, k.version FROM consents k
       WHERE k.client_id = c.id AND k.clinic_id = :clinicId AND k.deleted_at IS NULL
       ORDER BY k.consent_date DESC, k.created_at DESC LIMIT 1
     ) k ON true
     WHERE c.clinic_id = :clinicId AND c.deleted_at IS NULL
       AND (:search::text IS NULL OR c.first_name ILIKE :search OR c.last_name ILIKE :search OR c.email ILIKE :search
         OR concat_ws(' ', c.first_name, c.last_name) ILIKE :search)
     ORDER BY c.last_name, c.first_name, c.id LIMIT :limit`,
    { clinicId, search, limit: SEARCH_LIMIT },
  );
  return rows.map((c) => ({
    id: c.id,
    firstName: c.first_name,
    lastName: c.last_name,
    dateOfBirth: c.date_of_birth,
    email: c.email,
    hasConsent: c.consent_id !== null,
    consent:
      c.consent_id !== null
        ? {
            id: c.consent_id,
            signedName: c.typed_name!,
            signedOn: c.consent_date!,
            textVersion: c.consent_text_version!,
            version: c.consent_version!,
          }
        : null,
    updatedAt: iso(c.updated_at)!,
  }));
}

export type ClientTableRow = {
  id: string;
  first_name: string;
  last_name: string;
  date_of_birth: string | null;
  email: string | null;
  phone: string | null;
  notes: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  last_visit: Date | null;
  visits: string;
  has_consent: boolean;
  next_follow_up: string | null;
  keep_until: string;
  retention_due: boolean;
};

const SORT_SQL: Record<ClientTableQuery['sort'], string> = {
  name: 'lower(c.last_name) %DIR%, lower(c.first_name) %DIR%',
  dateOfBirth: 'c.date_of_birth %DIR% NULLS LAST',
  lastVisit: 'last_visit %DIR% NULLS LAST',
  keepUntil: 'keep_until %DIR%',
  updatedAt: 'c.updated_at %DIR%',
};

// The retention clock starts at the client's last visit (or the day they were added, before any visit) and runs
// for the clinic's retention period; nothing is erased by it, the admin reviews the clients it lists.
export const KEEP_UNTIL = `(COALESCE(
    (SELECT max(s.started_at) FROM recording_sessions s WHERE s.client_id = c.id AND s.deleted_at IS NULL),
    c.created_at)
  + make_interval(months => COALESCE(
    (SELECT cs.retention_months FROM clinic_settings cs WHERE cs.clinic_id = c.clinic_id), ${DEFAULT_RETENTION_MONTHS})))::date`;

// next_follow_up is the latest visit's follow-up, as the reminder job and the follow-ups-due list read it: a
// return visit fulfils the date that an earlier visit set.
const CLIENT_COLUMNS = `c.id, c.first_name, c.last_name, c.date_of_birth, c.email, c.phone, c.notes, c.version, c.created_at, c.updated_at,
  (SELECT max(s.started_at) FROM recording_sessions s WHERE s.client_id = c.id AND s.deleted_at IS NULL) AS last_visit,
  (SELECT count(*) FROM recording_sessions s WHERE s.client_id = c.id AND s.deleted_at IS NULL) AS visits,
  EXISTS (SELECT 1 FROM consents k WHERE k.client_id = c.id AND k.deleted_at IS NULL) AS has_consent,
  (SELECT s.follow_up_date FROM recording_sessions s
     WHERE s.client_id = c.id AND s.deleted_at IS NULL AND s.status <> 'cancelled'
     ORDER BY s.started_at DESC LIMIT 1) AS next_follow_up,
  to_char(${KEEP_UNTIL}, 'YYYY-MM-DD') AS keep_until,
  ${KEEP_UNTIL} < current_date AS retention_due`;

export async function pageClients(sequelize: Sequelize, clinicId: string, query: ClientTableQuery) {
  const search = query.q ? `%${escapeLike(query.q)}%` : null;
  const where = `c.clinic_id = :clinicId AND c.deleted_at IS NULL
    AND (:search::text IS NULL OR concat_ws(' ', c.first_name, c.last_name) ILIKE :search OR c.email ILIKE :search OR c.phone ILIKE :search)
    AND (:retention <> 'due' OR ${KEEP_UNTIL} < current_date)`;
  const order = SORT_SQL[query.sort].replaceAll('%DIR%', query.dir === 'desc' ? 'DESC' : 'ASC');
  const replacements = {
    clinicId,
    search,
    retention: query.retention,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  };
  const [rows, counts] = await Promise.all([
    selectRows<ClientTableRow>(
      sequelize,
      `SELECT ${CLIENT_COLUMNS} FROM clients c WHERE ${where} ORDER BY ${order}, c.id LIMIT :limit OFFSET :offset`,
      replacements,
    ),
    selectRows<{ total: string }>(
      sequelize,
      `SELECT count(*) AS total FROM clients c WHERE ${where}`,
      replacements,
    ),
  ]);
  return { rows, total: Number(counts[0]?.total ?? 0) };
}

export async function findClientRow(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  transaction?: Transaction,
) {
  const rows = await selectRows<ClientTableRow>(
    sequelize,
    `SELECT ${CLIENT_COLUMNS} FROM clients c WHERE c.clinic_id = :clinicId AND c.id = :clientId AND c.deleted_at IS NULL`,
    { clinicId, clientId },
    transaction,
  );
  return rows[0] ?? null;
}

export const listVisits = (sequelize: Sequelize, clinicId: string, clientId: string) =>
  selectRows<{
    id: string;
    started_at: Date;
    status: string;
    operator_name: string | null;
    follow_up_date: string | null;
    consent_version: number | null;
    sites_recorded: string;
    paid_from_package: boolean;
  }>(
    sequelize,
    `SELECT s.id, s.started_at, s.status, u.name AS operator_name, s.follow_up_date,
       (SELECT k.consent_text_version FROM consents k WHERE k.client_id = s.client_id AND k.deleted_at IS NULL
          AND k.consent_date <= s.started_at::date ORDER BY k.consent_date DESC, k.created_at DESC LIMIT 1) AS consent_version,
       (SELECT count(*) FROM site_recordings r WHERE r.session_id = s.id AND r.deleted_at IS NULL AND r.skipped_reason IS NULL) AS sites_recorded,
       EXISTS (SELECT 1 FROM package_visits p WHERE p.session_id = s.id) AS paid_from_package
     FROM recording_sessions s LEFT JOIN users u ON u.id = s.operator_id
     WHERE s.clinic_id = :clinicId AND s.client_id = :clientId AND s.deleted_at IS NULL
     ORDER BY s.started_at DESC`,
    { clinicId, clientId },
  );

export const listConsents = (sequelize: Sequelize, clinicId: string, clientId: string) =>
  selectRows<{
    id: string;
    typed_name: string;
    consent_date: string;
    consent_text_version: number;
    title: string;
    created_at: Date;
  }>(
    sequelize,
    `SELECT k.id, k.typed_name, k.consent_date, k.consent_text_version, t.title, k.created_at
     FROM consents k JOIN consent_texts t ON t.id = k.consent_text_id
     WHERE k.clinic_id = :clinicId AND k.client_id = :clientId AND k.deleted_at IS NULL
     ORDER BY k.consent_date DESC, k.created_at DESC`,
    { clinicId, clientId },
  );

export const listPackages = (sequelize: Sequelize, clinicId: string, clientId: string) =>
  selectRows<{
    id: string;
    description: string;
    visits_total: number;
    visits_used: number;
    status: 'active' | 'refunded';
    created_at: Date;
  }>(
    sequelize,
    `SELECT id, description, visits_total, visits_used, status, created_at FROM visit_packages
     WHERE clinic_id = :clinicId AND client_id = :clientId ORDER BY created_at DESC`,
    { clinicId, clientId },
  );

/** What a person writes about a client: the fields the admin's form and a new client carry. */
type ClientFields = {
  firstName: string;
  lastName: string;
  dateOfBirth: string | null;
  email: string | null;
  phone: string | null;
  notes: string | null;
};

export async function insertClient(
  sequelize: Sequelize,
  row: ClientFields & { id: string; clinicId: string },
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO clients (id, clinic_id, first_name, last_name, date_of_birth, email, phone, notes)
     VALUES (:id, :clinicId, :firstName, :lastName, :dateOfBirth, :email, :phone, :notes)`,
    row,
    transaction,
  );
}

/** Bumps the version like a synced edit does, so devices pull the change; a stale version changes nothing. */
export const updateClientIfVersion = (
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  version: number,
  fields: ClientFields,
  transaction?: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE clients SET first_name = :firstName, last_name = :lastName, date_of_birth = :dateOfBirth, email = :email, phone = :phone,
       notes = :notes, version = version + 1, updated_at = now()
     WHERE clinic_id = :clinicId AND id = :clientId AND version = :version AND deleted_at IS NULL`,
    { clinicId, clientId, version, ...fields },
    transaction,
  );
