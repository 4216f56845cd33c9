import type { SessionSummary } from '@/shared/protocol';
import { Client, RecordingSession, SiteRecording, User } from '../models';

const LIST_LIMIT = 200;
const SITE_ORDER = ['mitral', 'tricuspid', 'aortic', 'pulmonic'] as const;

export async function listSessions(clinicId: string): Promise<SessionSummary[]> {
  const sessions = await RecordingSession.findAll({
    where: { clinicId },
    include: [
      { model: Client, as: 'client', attributes: ['firstName', 'lastName'], where: { clinicId } },
      { model: User, as: 'operator', attributes: ['name'], required: false },
      {
        model: SiteRecording,
        as: 'siteRecordings',
        attributes: ['site', 'qualityVerdict', 'skippedReason'],
        required: false,
      },
    ],
    order: [
      ['startedAt', 'DESC'],
      ['id', 'ASC'],
    ],
    limit: LIST_LIMIT,
  });
  return sessions.map((s) => ({
    id: s.id,
    clientId: s.clientId,
    clientName: s.client ? `${s.client.firstName} ${s.client.lastName}` : '',
    operatorName: s.operator?.name ?? null,
    status: s.status,
    startedAt: s.startedAt.toISOString(),
    finishedAt: s.finishedAt ? s.finishedAt.toISOString() : null,
    followUpDate: s.followUpDate ?? null,
    sites: [...(s.siteRecordings ?? [])]
      .sort((a, b) => SITE_ORDER.indexOf(a.site) - SITE_ORDER.indexOf(b.site))
      .map((r) => ({ site: r.site, verdict: r.qualityVerdict ?? null, skipped: r.skippedReason != null })),
  }));
}
