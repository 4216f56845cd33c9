import { v4 as uuid } from 'uuid';
import { sites } from '@/shared/sites';
import type { AnalysisResult } from '@/shared/analysis/types';
import type { Site } from '@/shared/protocol';
import { read, transaction } from './database';
import type { DisplayTrace, LocalSession, RecordingSource, SiteRecording } from './records';
import { selectInto } from './columns';

/** A session row read straight into `LocalSession`. */
export const sessionColumns = selectInto<LocalSession>()(
  'id client_id consent_id status current_site clip_seconds started_at finished_at version updated_at',
);

/** A recording row as read: its analysis and trace still JSON text, whether a plain clip is held as 0 or 1. */
type RecordingRow = Omit<SiteRecording, 'analysis' | 'trace' | 'hasPlainClip'> & {
  analysisJson: string | null;
  traceJson: string | null;
  hasPlainClip: number;
};

const recordingColumns = selectInto<RecordingRow>()(
  'id session_id site outcome source skip_reason note verdict heart_rate_bpm duration_s sample_rate analysis_json trace_json blob_hash size_bytes updated_at',
  { hasPlainClip: 'clip_wav IS NOT NULL' },
);

function toRecording({ analysisJson, traceJson, hasPlainClip, ...row }: RecordingRow): SiteRecording {
  return {
    ...row,
    analysis: analysisJson ? (JSON.parse(analysisJson) as AnalysisResult) : null,
    trace: traceJson ? (JSON.parse(traceJson) as DisplayTrace) : null,
    hasPlainClip: Boolean(hasPlainClip),
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
    return db.getFirstAsync<LocalSession>(
      `SELECT ${sessionColumns} FROM sessions WHERE id = ? AND deleted_at IS NULL`,
      id,
    );
  });
}

export function listSessionsForClient(clientId: string): Promise<LocalSession[]> {
  return read(async (db) => {
    return db.getAllAsync<LocalSession>(
      `SELECT ${sessionColumns} FROM sessions WHERE client_id = ? AND deleted_at IS NULL ORDER BY started_at DESC`,
      clientId,
    );
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
