import type { Sequelize } from 'sequelize';
import { selectRows } from './sql';

export const exportSessions = (sequelize: Sequelize, clinicId: string, clientId: string) =>
  selectRows<{
    id: string;
    status: string;
    started_at: Date;
    finished_at: Date | null;
    findings: string | null;
    plan: string | null;
    follow_up_date: string | null;
    operator_name: string | null;
    reviewer_name: string | null;
    reviewed_at: Date | null;
  }>(
    sequelize,
    `SELECT s.id, s.status, s.started_at, s.finished_at, s.findings, s.plan, s.follow_up_date, o.name AS operator_name,
       r.name AS reviewer_name, s.reviewed_at
     FROM recording_sessions s LEFT JOIN users o ON o.id = s.operator_id LEFT JOIN users r ON r.id = s.reviewed_by
     WHERE s.clinic_id = :clinicId AND s.client_id = :clientId AND s.deleted_at IS NULL ORDER BY s.started_at`,
    { clinicId, clientId },
  );

export const exportSiteRecordings = (sequelize: Sequelize, clinicId: string, clientId: string) =>
  selectRows<{
    id: string;
    session_id: string;
    site: string;
    quality_verdict: string | null;
    duration_s: number | null;
    recorded_at: Date | null;
    analysis: unknown;
    skipped_reason: string | null;
    clip_sha256: string | null;
    storage_key: string | null;
    content_type: string | null;
    blob_state: string | null;
  }>(
    sequelize,
    `SELECT r.id, r.session_id, r.site, r.quality_verdict, r.duration_s, r.recorded_at, r.analysis, r.skipped_reason, r.clip_sha256,
       b.storage_key, b.content_type, b.state AS blob_state
     FROM site_recordings r JOIN recording_sessions s ON s.id = r.session_id
     LEFT JOIN clip_blobs b ON b.sha256 = r.clip_sha256 AND b.clinic_id = r.clinic_id
     WHERE s.clinic_id = :clinicId AND s.client_id = :clientId AND s.deleted_at IS NULL AND r.deleted_at IS NULL
     ORDER BY s.started_at, array_position(ARRAY['mitral','tricuspid','aortic','pulmonic'], r.site)`,
    { clinicId, clientId },
  );

export async function clinicName(sequelize: Sequelize, clinicId: string): Promise<string> {
  const rows = await selectRows<{ name: string }>(
    sequelize,
    `SELECT name FROM clinics WHERE id = :clinicId`,
    { clinicId },
  );
  return rows[0]?.name ?? '';
}
