import { v4 as uuid } from 'uuid';
import { sites } from '@/shared/sites';
import type { AnalysisResult } from '@/shared/analysis/types';
import type { Site } from '@/shared/protocol';
import { read, transaction } from './database';
import type { DisplayTrace, LocalSession, RecordingSource, SiteRecording } from './records';

type SessionRow = {
  id: string;
  client_id: string;
  consent_id: string;
  status: LocalSession['status'];
  current_site: Site | 'review';
  clip_seconds: number;
  started_at: string;
  finished_at: string | null;
  version: number;
  updated_at: string;
};

type RecordingRow = {
  id: string;
  session_id: string;
  site: Site;
  outcome: SiteRecording['outcome'];
  source: RecordingSource | null;
  skip_reason: string | null;
  note: string | null;
  verdict: SiteRecording['verdict'];
  heart_rate_bpm: number | null;
  duration_s: number | null;
  sample_rate: number | null;
  analysis_json: string | null;
  trace_json: string | null;
  has_clip: number;
  blob_hash: string | null;
  size_bytes: number | null;
  updated_at: string;
};

const recordingColumns = `id, session_id, site, outcome, source, skip_reason, note, verdict, heart_rate_bpm, duration_s,
  sample_rate, analysis_json, trace_json, clip_wav IS NOT NULL AS has_clip, blob_hash, size_bytes, updated_at`;

function toSession(row: SessionRow): LocalSession {
  return {
    id: row.id,
    clientId: row.client_id,
    consentId: row.consent_id,
    status: row.status,
    currentSite: row.current_site,
    clipSeconds: row.clip_seconds,
    startedAt: row.started_at,
    finishedAt: row.finished_at,
    version: row.version,
    updatedAt: row.updated_at,
  };
}

function toRecording(row: RecordingRow): SiteRecording {
  return {
    id: row.id,
    sessionId: row.session_id,
    site: row.site,
    outcome: row.outcome,
    source: row.source,
    skipReason: row.skip_reason,
    note: row.note,
    verdict: row.verdict,
    heartRateBpm: row.heart_rate_bpm,
    durationS: row.duration_s,
    sampleRate: row.sample_rate,
    analysis: row.analysis_json ? (JSON.parse(row.analysis_json) as AnalysisResult) : null,
    trace: row.trace_json ? (JSON.parse(row.trace_json) as DisplayTrace) : null,
    hasPlainClip: Boolean(row.has_clip),
    blobHash: row.blob_hash,
    sizeBytes: row.size_bytes,
    updatedAt: row.updated_at,
  };
}

export const defaultClipSeconds = 15;

export async function startSession(
  input: { clientId: string; consentId: string; clipSeconds?: number },
  now = new Date(),
): Promise<LocalSession> {
  const stamp = now.toISOString();
  const session: LocalSession = {
    id: uuid(),
    clientId: input.clientId,
    consentId: input.consentId,
    status: 'in_progress',
    currentSite: sites[0]!.id,
    clipSeconds: input.clipSeconds ?? defaultClipSeconds,
    startedAt: stamp,
    finishedAt: null,
    version: 0,
    updatedAt: stamp,
  };
  await transaction(async (db) => {
    await db.runAsync(
      `INSERT INTO sessions (id, client_id, consent_id, status, current_site, clip_seconds, started_at, updated_at)
       VALUES (?, ?, ?, 'in_progress', ?, ?, ?, ?)`,
      session.id,
      session.clientId,
      session.consentId,
      session.currentSite,
      session.clipSeconds,
      stamp,
      stamp,
    );
  });
  return session;
}

export function getSession(id: string): Promise<LocalSession | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<SessionRow>(
      'SELECT * FROM sessions WHERE id = ? AND deleted_at IS NULL',
      id,
    );
    return row ? toSession(row) : null;
  });
}

export function listSessionsForClient(clientId: string): Promise<LocalSession[]> {
  return read(async (db) => {
    const rows = await db.getAllAsync<SessionRow>(
      'SELECT * FROM sessions WHERE client_id = ? AND deleted_at IS NULL ORDER BY started_at DESC',
      clientId,
    );
    return rows.map(toSession);
  });
}

export function listRecordings(sessionId: string): Promise<SiteRecording[]> {
  return read(async (db) => {
    const rows = await db.getAllAsync<RecordingRow>(
      `SELECT ${recordingColumns} FROM site_recordings WHERE session_id = ? AND deleted_at IS NULL`,
      sessionId,
    );
    return rows.map(toRecording);
  });
}

export function readPlainClip(sessionId: string, site: Site): Promise<Uint8Array | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<{ clip_wav: Uint8Array | null }>(
      'SELECT clip_wav FROM site_recordings WHERE session_id = ? AND site = ?',
      sessionId,
      site,
    );
    return row?.clip_wav ? new Uint8Array(row.clip_wav) : null;
  });
}

export type KeptTake = {
  sessionId: string;
  site: Site;
  source: RecordingSource;
  wav: Uint8Array;
  analysis: AnalysisResult;
  trace: DisplayTrace;
  note: string | null;
  nextSite: Site | 'review';
};

/** A kept take replaces any earlier one for the site, and the session moves on, in one transaction. */
export async function keepTake(take: KeptTake, now = new Date()): Promise<void> {
  const stamp = now.toISOString();
  await transaction(async (db) => {
    await assertOpen(db, take.sessionId);
    await db.runAsync(
      `INSERT INTO site_recordings (id, session_id, site, outcome, source, skip_reason, note, verdict, heart_rate_bpm,
         duration_s, sample_rate, analysis_json, trace_json, clip_wav, size_bytes, updated_at)
       VALUES (?, ?, ?, 'recorded', ?, NULL, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)
       ON CONFLICT(session_id, site) DO UPDATE SET outcome = 'recorded', source = excluded.source, skip_reason = NULL,
         note = excluded.note, verdict = excluded.verdict, heart_rate_bpm = excluded.heart_rate_bpm,
         duration_s = excluded.duration_s, sample_rate = excluded.sample_rate, analysis_json = excluded.analysis_json,
         trace_json = excluded.trace_json, clip_wav = excluded.clip_wav, size_bytes = excluded.size_bytes,
         updated_at = excluded.updated_at`,
      uuid(),
      take.sessionId,
      take.site,
      take.source,
      take.note,
      take.analysis.quality.verdict,
      take.analysis.heartRateBpm,
      take.analysis.durationS,
      take.analysis.sampleRate,
      JSON.stringify(take.analysis),
      JSON.stringify(take.trace),
      take.wav,
      take.wav.byteLength,
      stamp,
    );
    await moveTo(db, take.sessionId, take.nextSite, stamp);
  });
}

export async function skipSite(
  input: { sessionId: string; site: Site; reason: string; nextSite: Site | 'review' },
  now = new Date(),
): Promise<void> {
  const stamp = now.toISOString();
  await transaction(async (db) => {
    await assertOpen(db, input.sessionId);
    await db.runAsync(
      `INSERT INTO site_recordings (id, session_id, site, outcome, skip_reason, updated_at)
       VALUES (?, ?, ?, 'skipped', ?, ?)
       ON CONFLICT(session_id, site) DO UPDATE SET outcome = 'skipped', source = NULL, skip_reason = excluded.skip_reason,
         note = NULL, verdict = NULL, heart_rate_bpm = NULL, duration_s = NULL, sample_rate = NULL, analysis_json = NULL,
         trace_json = NULL, clip_wav = NULL, size_bytes = NULL, updated_at = excluded.updated_at`,
      uuid(),
      input.sessionId,
      input.site,
      input.reason,
      stamp,
    );
    await moveTo(db, input.sessionId, input.nextSite, stamp);
  });
}

export async function setCurrentSite(
  sessionId: string,
  site: Site | 'review',
  now = new Date(),
): Promise<void> {
  await transaction(async (db) => {
    await assertOpen(db, sessionId);
    await moveTo(db, sessionId, site, now.toISOString());
  });
}

async function moveTo(
  db: Parameters<Parameters<typeof transaction>[0]>[0],
  sessionId: string,
  site: Site | 'review',
  stamp: string,
) {
  await db.runAsync(
    'UPDATE sessions SET current_site = ?, updated_at = ? WHERE id = ?',
    site,
    stamp,
    sessionId,
  );
}

async function assertOpen(
  db: Parameters<Parameters<typeof transaction>[0]>[0],
  sessionId: string,
): Promise<void> {
  const row = await db.getFirstAsync<{ status: string }>(
    'SELECT status FROM sessions WHERE id = ?',
    sessionId,
  );
  if (!row) throw new Error('This session is not on this device.');
  if (row.status !== 'in_progress')
    throw new Error('This session is finished and sealed; start a new session to record again.');
}

/**
 * Drops a session that was started but not finished (the wrong client, a visit cut short). It has never left the
 * device, so there is nothing to tell the clinic; its takes are deleted, and secure_delete overwrites their pages.
 */
export async function discardSession(sessionId: string): Promise<void> {
  await transaction(async (db) => {
    const session = await db.getFirstAsync<{ status: string }>(
      'SELECT status FROM sessions WHERE id = ? AND deleted_at IS NULL',
      sessionId,
    );
    if (!session) throw new Error('This session is not on this device.');
    if (session.status !== 'in_progress')
      throw new Error('A finished session is sealed for the clinic and cannot be discarded here.');
    await db.runAsync('DELETE FROM site_recordings WHERE session_id = ?', sessionId);
    await db.runAsync('DELETE FROM sessions WHERE id = ?', sessionId);
  });
}
