import type { Site } from '@/shared/protocol';
import type {
  Comparison,
  EarlierVisit,
  ReviewSessionDetail,
  ReviewSite,
  SessionReferral,
  Trace,
  Trends,
} from '@/shared/protocol/review';
import type { StoredTrace } from '@/shared/protocol/analysis';
import { screensInVisit } from '@/shared/analysis/murmur';
import type { MurmurScreen } from '@/shared/analysis/types';
import { decodeWav } from '@/shared/analysis/wav';
import { isSealed } from '@/shared/seal';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import { findClipBlob, saveClipTrace } from '../../repositories/clip-blobs-repository';
import {
  findClient,
  findReferralFlag,
  findSessionRecord,
  findSiteRecords,
  findSiteSummaries,
  listClientSessions,
  type ReferralFlagRecord,
  type SessionRecord,
  type SiteRecord,
} from '../../repositories/review-repository';
import { traceOfClip } from '../clip-trace';
import type { Caller, UseCaseDeps } from '../context';
import {
  evaluateSite,
  measurementDefs,
  metricValue,
  siteReferralReasons,
  statusOf,
  type RangeLookup,
} from './measurements';
import { rangesForClinic } from './ranges';

export const SITES: readonly Site[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

export const sessionNotFound = () =>
  new AppError('not_found', 'There is no such session in this clinic.', 404);

export async function loadSession(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
): Promise<SessionRecord> {
  const session = await findSessionRecord(deps.sequelize, caller.clinicId, sessionId);
  if (!session) throw sessionNotFound();
  return session;
}

/** `murmurScreen`: the site's screen as its visit reads it (`screensInVisit`), not only the clip's own. */
export function reviewSite(
  site: Site,
  record: SiteRecord | undefined,
  ranges: RangeLookup,
  murmurScreen: MurmurScreen | null,
): ReviewSite {
  const analysis = record?.analysis ?? null;
  const metrics = analysis?.metrics ?? null;
  const measurements = evaluateSite(metrics, site, ranges);
  const referralReasons = analysis ? siteReferralReasons(metrics, measurements, murmurScreen) : [];
  return {
    site,
    recordingId: record?.id ?? null,
    qualityVerdict: record?.qualityVerdict ?? null,
    qualityReasons: analysis
      ? analysis.quality.reasons.map((r) => r.message)
      : record?.analysisProblem
        ? [record.analysisProblem]
        : [],
    clipState: record?.clipState ?? 'none',
    hasAudio: Boolean(record?.clipSha256) && record?.clipState === 'stored',
    durationS: analysis?.durationS ?? record?.durationS ?? null,
    skippedReason: record?.skippedReason ?? null,
    heartRateBpm: metricValue(metrics, 'heartRateBpm') ?? analysis?.heartRateBpm ?? null,
    irregularRhythm: metrics?.irregularRhythm === true,
    sounds: soundMarks(record),
    measurements,
    murmurScreen,
    referral: referralReasons.length > 0,
    referralReasons,
  };
}

const soundMarks = (record: SiteRecord | undefined) =>
  (record?.analysis?.sounds ?? []).map((s) => ({ type: s.type, startS: s.startS, endS: s.endS }));

const SITE_NAMES: Record<Site, string> = {
  mitral: 'Mitral',
  tricuspid: 'Tricuspid',
  aortic: 'Aortic',
  pulmonic: 'Pulmonic',
};

/** The one answer to "is this session flagged for referral, and why" that every screen, report and mail reads. */
export function sessionReferral(sites: ReviewSite[], manual: ReferralFlagRecord | null): SessionReferral {
  const reasons = sites.flatMap((s) => s.referralReasons.map((r) => `${SITE_NAMES[s.site]}: ${r}`));
  if (manual) reasons.push(`Flagged by ${manual.flaggedByName ?? 'a practitioner'}: ${manual.note}`);
  return {
    flagged: reasons.length > 0,
    reasons,
    manual: manual
      ? { note: manual.note, flaggedBy: manual.flaggedByName, flaggedAt: manual.flaggedAt.toISOString() }
      : null,
  };
}

/** The four sites of a session as the review reads them, and its referral. */
export async function reviewSitesOf(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
): Promise<{ sites: ReviewSite[]; records: SiteRecord[]; referral: SessionReferral }> {
  const ranges = await rangesForClinic(deps.sequelize, caller.clinicId);
  const records = (await findSiteRecords(deps.sequelize, caller.clinicId, [sessionId])).get(sessionId) ?? [];
  const bySite = SITES.map((site) => records.find((r) => r.site === site));
  const screens = screensInVisit(bySite.map((r) => r?.analysis?.screen ?? null));
  const sites = SITES.map((site, i) => reviewSite(site, bySite[i], ranges, screens[i] ?? null));
  const manual = await findReferralFlag(deps.sequelize, caller.clinicId, sessionId);
  return { sites, records, referral: sessionReferral(sites, manual) };
}

export async function sessionDetail(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
): Promise<ReviewSessionDetail> {
  const session = await loadSession(deps, caller, sessionId);
  const { sites, referral } = await reviewSitesOf(deps, caller, sessionId);
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'review.session.read',
    entity: 'recording_sessions',
    entityId: sessionId,
    ip: caller.ip,
    details: { findingsShown: true },
  });
  return {
    id: session.id,
    clinicName: session.clinicName,
    client: {
      id: session.clientId,
      firstName: session.clientFirstName,
      lastName: session.clientLastName,
      dateOfBirth: session.clientDateOfBirth,
      email: session.clientEmail,
    },
    operatorName: session.operatorName,
    status: session.status,
    startedAt: session.startedAt.toISOString(),
    finishedAt: session.finishedAt?.toISOString() ?? null,
    notes: notesOf(session),
    sites,
    flagged: referral.flagged,
    referral,
  };
}

export function notesOf(session: SessionRecord) {
  return {
    findings: session.findings,
    plan: session.plan,
    followUpDate: session.followUpDate,
    version: session.version,
    reviewedBy: session.reviewedByName,
    reviewedAt: session.reviewedAt?.toISOString() ?? null,
  };
}

/** The clip's WAV bytes, opened if sealed. */
export async function clipBytes(
  deps: UseCaseDeps,
  caller: Caller,
  record: SiteRecord | undefined,
): Promise<Uint8Array> {
  if (!record?.clipSha256) throw new AppError('no_clip', 'This site has no clip.', 404);
  const blob = await findClipBlob(deps.sequelize, caller.clinicId, record.clipSha256);
  if (!blob?.storageKey || blob.state !== 'stored')
    throw new AppError('clip_not_stored', 'The clip for this site has not reached the server yet.', 409);
  return openStoredClip(deps, caller, blob.storageKey);
}

async function openStoredClip(deps: UseCaseDeps, caller: Caller, storageKey: string): Promise<Uint8Array> {
  const { blobStore, openClip } = deps.services;
  const bytes = await blobStore.get(storageKey);
  if (!bytes)
    throw new AppError('clip_missing', 'The clip is recorded but its file is missing on the server.', 410);
  if (!isSealed(bytes)) return bytes;
  if (!openClip)
    throw new AppError('clip_sealed', 'The clip is sealed and this server has no key to open it.', 409);
  try {
    return await openClip(caller.clinicId, bytes);
  } catch {
    throw new AppError(
      'clip_unopenable',
      'The clip is sealed with a key this server does not hold, or it is damaged.',
      422,
    );
  }
}

/**
 * The clip's display trace, kept when the clip was processed. A clip processed before traces were kept is opened
 * and drawn once here, and its trace kept for every later view.
 */
export async function clipTrace(
  deps: UseCaseDeps,
  caller: Caller,
  record: SiteRecord | undefined,
): Promise<StoredTrace> {
  if (!record?.clipSha256) throw new AppError('no_clip', 'This site has no clip.', 404);
  const blob = await findClipBlob(deps.sequelize, caller.clinicId, record.clipSha256);
  if (!blob?.storageKey || blob.state !== 'stored')
    throw new AppError('clip_not_stored', 'The clip for this site has not reached the server yet.', 409);
  if (blob.trace) return blob.trace;
  const bytes = await openStoredClip(deps, caller, blob.storageKey);
  let trace: StoredTrace;
  try {
    const wav = decodeWav(bytes);
    trace = traceOfClip(wav.samples, wav.sampleRate);
  } catch (error) {
    throw new AppError(
      'clip_unreadable',
      `The clip could not be read: ${error instanceof Error ? error.message : String(error)}`,
      422,
    );
  }
  await saveClipTrace(deps.sequelize, caller.clinicId, record.clipSha256, trace);
  return trace;
}

async function siteRecord(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  site: Site,
): Promise<SiteRecord | undefined> {
  await loadSession(deps, caller, sessionId);
  const records = (await findSiteRecords(deps.sequelize, caller.clinicId, [sessionId])).get(sessionId) ?? [];
  return records.find((r) => r.site === site);
}

/** Listening to a recording or drawing its trace is on record, like opening the visit. */
const auditRecordingOpened = (
  caller: Caller,
  action: 'review.recording.play' | 'review.recording.trace',
  record: SiteRecord | undefined,
  sessionId: string,
  site: Site,
) =>
  recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action,
    entity: 'site_recordings',
    entityId: record?.id,
    ip: caller.ip,
    details: { sessionId, site },
  });

export async function siteAudio(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  site: Site,
): Promise<Uint8Array> {
  const record = await siteRecord(deps, caller, sessionId, site);
  const bytes = await clipBytes(deps, caller, record);
  await auditRecordingOpened(caller, 'review.recording.play', record, sessionId, site);
  return bytes;
}

export async function siteTrace(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  site: Site,
): Promise<Trace> {
  const record = await siteRecord(deps, caller, sessionId, site);
  const trace = await clipTrace(deps, caller, record);
  await auditRecordingOpened(caller, 'review.recording.trace', record, sessionId, site);
  return { site, ...trace, sounds: soundMarks(record) };
}

export async function earlierVisits(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
): Promise<EarlierVisit[]> {
  const session = await loadSession(deps, caller, sessionId);
  const visits = (await listClientSessions(deps.sequelize, caller.clinicId, session.clientId)).filter(
    (v) => v.id !== sessionId && v.startedAt < session.startedAt,
  );
  const records = await findSiteSummaries(
    deps.sequelize,
    caller.clinicId,
    visits.map((v) => v.id),
  );
  const rank = { good: 1, usable: 2, retake: 3 } as const;
  return visits.reverse().map((v) => {
    const verdicts = (records.get(v.id) ?? [])
      .map((r) => r.qualityVerdict)
      .filter((q): q is 'good' | 'usable' | 'retake' => q !== null);
    const worst = verdicts.sort((a, b) => rank[b] - rank[a])[0] ?? null;
    return { id: v.id, startedAt: v.startedAt.toISOString(), status: v.status, worstQuality: worst };
  });
}

export async function compareSessions(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  otherId: string,
): Promise<Comparison> {
  const now = await loadSession(deps, caller, sessionId);
  const then = await loadSession(deps, caller, otherId);
  if (then.clientId !== now.clientId)
    throw new AppError('other_client', 'Only visits of the same client can be compared.', 400);
  const records = await findSiteRecords(deps.sequelize, caller.clinicId, [now.id, then.id]);
  const ofSite = (id: string, site: Site) => records.get(id)?.find((r) => r.site === site);
  const rows = SITES.flatMap((site) =>
    measurementDefs.map((def) => {
      const a = metricValue(ofSite(then.id, site)?.analysis?.metrics, def.key);
      const b = metricValue(ofSite(now.id, site)?.analysis?.metrics, def.key);
      return {
        site,
        key: def.key,
        label: def.label,
        unit: def.unit,
        then: a,
        now: b,
        change: a !== null && b !== null ? b - a : null,
      };
    }),
  );
  const firstS1 = (id: string, site: Site) =>
    ofSite(id, site)?.analysis?.sounds?.find((s) => s.type === 'S1')?.startS ?? null;
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'review.session.compare',
    entity: 'recording_sessions',
    entityId: now.id,
    ip: caller.ip,
    details: { comparedWith: then.id },
  });
  return {
    now: { id: now.id, startedAt: now.startedAt.toISOString() },
    then: { id: then.id, startedAt: then.startedAt.toISOString() },
    rows,
    firstS1: SITES.map((site) => ({ site, now: firstS1(now.id, site), then: firstS1(then.id, site) })),
  };
}

export async function clientTrends(deps: UseCaseDeps, caller: Caller, clientId: string): Promise<Trends> {
  const client = await findClient(deps.sequelize, caller.clinicId, clientId);
  if (!client) throw new AppError('not_found', 'There is no such client in this clinic.', 404);
  const visits = await listClientSessions(deps.sequelize, caller.clinicId, clientId);
  const records = await findSiteSummaries(
    deps.sequelize,
    caller.clinicId,
    visits.map((v) => v.id),
  );
  const ranges = await rangesForClinic(deps.sequelize, caller.clinicId);
  const series = SITES.flatMap((site) =>
    measurementDefs.map((def) => {
      const range = ranges(def.key, site);
      return {
        site,
        key: def.key,
        label: def.label,
        unit: def.unit,
        range,
        points: visits.map((v) => {
          const value = metricValue(
            records.get(v.id)?.find((r) => r.site === site)?.analysis?.metrics,
            def.key,
          );
          return {
            sessionId: v.id,
            startedAt: v.startedAt.toISOString(),
            value,
            status: statusOf(value, range),
          };
        }),
      };
    }),
  );
  const murmurScreens = visits.flatMap((v) => {
    const analysed = (records.get(v.id) ?? [])
      .filter((r) => r.analysis !== null)
      .sort((a, b) => SITES.indexOf(a.site) - SITES.indexOf(b.site));
    const screens = screensInVisit(analysed.map((r) => r.analysis?.screen ?? null));
    return analysed.map((r, i) => ({
      sessionId: v.id,
      startedAt: v.startedAt.toISOString(),
      site: r.site,
      screen: screens[i] ?? null,
    }));
  });
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'review.client.trends',
    entity: 'clients',
    entityId: clientId,
    ip: caller.ip,
  });
  return { client, series, murmurScreens };
}
