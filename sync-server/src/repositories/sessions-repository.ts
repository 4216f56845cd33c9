import type { Sequelize } from 'sequelize';
import { siteSchema, type SessionSummary, type Site } from '@/shared/protocol';
import { iso, selectRows } from './sql';

const LIST_LIMIT = 200;

/** The clinic's newest visits with their client, operator and the verdict of each site. */
export async function listSessions(sequelize: Sequelize, clinicId: string): Promise<SessionSummary[]> {
  const rows = await selectRows<{
    id: string;
    client_id: string;
    client_name: string;
    operator_name: string | null;
    status: SessionSummary['status'];
    started_at: Date;
    finished_at: Date | null;
    follow_up_date: string | null;
    sites: { site: Site; verdict: SessionSummary['sites'][number]['verdict']; skipped: boolean }[];
  }>(
    sequelize,
    `SELECT s.id, s.client_id, c.first_name || ' ' || c.last_name AS client_name, u.name AS operator_name, s.status,
       s.started_at, s.finished_at, to_char(s.follow_up_date, 'YYYY-MM-DD') AS follow_up_date,
       coalesce((SELECT json_agg(json_build_object('site', r.site, 'verdict', r.quality_verdict,
           'skipped', r.skipped_reason IS NOT NULL) ORDER BY array_position(CAST(:siteOrder AS text[]), r.site::text))
         FROM site_recordings r WHERE r.session_id = s.id AND r.deleted_at IS NULL), '[]') AS sites
     FROM recording_sessions s
     JOIN clients c ON c.id = s.client_id AND c.clinic_id = :clinicId AND c.deleted_at IS NULL
     LEFT JOIN users u ON u.id = s.operator_id
     WHERE s.clinic_id = :clinicId AND s.deleted_at IS NULL
     ORDER BY s.started_at DESC, s.id LIMIT :limit`,
    { clinicId, limit: LIST_LIMIT, siteOrder: `{${siteSchema.options.join(',')}}` },
  );
  return rows.map((s) => ({
    id: s.id,
    clientId: s.client_id,
    clientName: s.client_name,
    operatorName: s.operator_name,
    status: s.status,
    startedAt: iso(s.started_at)!,
    finishedAt: iso(s.finished_at),
    followUpDate: s.follow_up_date,
    sites: s.sites,
  }));
}
