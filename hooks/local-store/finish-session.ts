import { v4 as uuid } from 'uuid';
import { siteInfo } from '@/constants/sites';
import { sealClip, sha256Hex } from '@/shared/seal';
import type { Site } from '@/shared/protocol';
import { cachedClinicKey } from './clinic-key';
import { read, transaction, write } from './database';
import { enqueue } from './outbox';

export class MissingClinicKeyError extends Error {
  constructor() {
    super(
      'This device has not yet received the clinic’s sealing key, so the clips cannot be sealed. Connect to the clinic network once (open the outbox), then finish again; the recordings stay saved here.',
    );
    this.name = 'MissingClinicKeyError';
  }
}

type PlainClip = { id: string; site: Site; clip_wav: Uint8Array };

function mutation(entity: string, rowId: string, baseVersion: number, change: Record<string, unknown>) {
  return { mutationId: uuid(), entity, rowId, baseVersion, change };
}

/**
 * Seals every clip of the session for the clinic and queues the session's rows and clips. Sealing happens in
 * memory first; one transaction then stores the sealed blobs, drops the plaintext and queues everything, so a tab
 * closed half-way leaves the session open (and resumable) rather than half-sealed.
 */
export async function finishSession(sessionId: string, now = new Date()): Promise<{ clips: number }> {
  const key = await cachedClinicKey();
  if (!key) throw new MissingClinicKeyError();
  const plain = await read((db) =>
    db.getAllAsync<PlainClip>(
      "SELECT id, site, clip_wav FROM site_recordings WHERE session_id = ? AND outcome = 'recorded' AND clip_wav IS NOT NULL",
      sessionId,
    ),
  );
  const sealed = plain.map((clip) => {
    const bytes = sealClip(new Uint8Array(clip.clip_wav), key);
    return { ...clip, sealed: bytes, hash: sha256Hex(bytes) };
  });
  const stamp = now.toISOString();

  await transaction(async (db) => {
    const session = await db.getFirstAsync<Record<string, unknown> & { status: string; client_id: string; consent_id: string; version: number }>(
      'SELECT * FROM sessions WHERE id = ?',
      sessionId,
    );
    if (!session) throw new Error('This session is not on this device.');
    if (session.status !== 'in_progress') throw new Error('This session is already finished.');
    const client = await db.getFirstAsync<Record<string, unknown> & { origin: string; first_name: string; last_name: string; version: number }>(
      'SELECT * FROM clients WHERE id = ?',
      session.client_id,
    );
    if (!client) throw new Error('The session’s client is missing on this device.');
    const who = `${client.first_name} ${client.last_name}`;

    for (const clip of sealed) {
      await db.runAsync(
        'INSERT OR IGNORE INTO sealed_blobs (hash, bytes, size_bytes, created_at) VALUES (?, ?, ?, ?)',
        clip.hash,
        clip.sealed,
        clip.sealed.byteLength,
        stamp,
      );
      await db.runAsync(
        'UPDATE site_recordings SET clip_wav = NULL, blob_hash = ?, size_bytes = ?, updated_at = ? WHERE id = ?',
        clip.hash,
        clip.sealed.byteLength,
        stamp,
        clip.id,
      );
    }

    const queued = await db.getFirstAsync<{ n: number }>(
      "SELECT count(*) AS n FROM outbox WHERE entity = 'client' AND row_id = ?",
      session.client_id,
    );
    if (client.origin === 'device' && !queued?.n) {
      const change = { firstName: client.first_name, lastName: client.last_name, dateOfBirth: client.date_of_birth, email: client.email, phone: client.phone };
      const body = mutation('client', session.client_id, client.version, change);
      await enqueue(db, { kind: 'mutation', entity: 'client', rowId: session.client_id, mutation: body, sizeBytes: JSON.stringify(body).length, label: `Client ${who}` }, now);
    }
    const consent = await db.getFirstAsync<Record<string, unknown>>('SELECT * FROM consents WHERE id = ?', session.consent_id);
    const consentQueued = await db.getFirstAsync<{ n: number }>(
      "SELECT count(*) AS n FROM outbox WHERE entity = 'consent' AND row_id = ?",
      session.consent_id,
    );
    if (consent && !consentQueued?.n) {
      const body = mutation('consent', session.consent_id, 0, {
        clientId: consent.client_id,
        signedName: consent.signed_name,
        signedOn: consent.signed_on,
        textVersion: consent.text_version,
      });
      await enqueue(db, { kind: 'mutation', entity: 'consent', rowId: session.consent_id, mutation: body, sizeBytes: JSON.stringify(body).length, label: `Consent of ${who}` }, now);
    }

    await db.runAsync("UPDATE sessions SET status = 'completed', finished_at = ?, updated_at = ? WHERE id = ?", stamp, stamp, sessionId);
    const sessionBody = mutation('session', sessionId, session.version, {
      clientId: session.client_id,
      consentId: session.consent_id,
      status: 'completed',
      clipSeconds: session.clip_seconds,
      startedAt: session.started_at,
      finishedAt: stamp,
    });
    await enqueue(db, { kind: 'mutation', entity: 'session', rowId: sessionId, mutation: sessionBody, sizeBytes: JSON.stringify(sessionBody).length, label: `Session of ${who}` }, now);

    const recordings = await db.getAllAsync<Record<string, unknown> & { id: string; site: Site }>(
      'SELECT id, site, outcome, source, skip_reason, note, verdict, heart_rate_bpm, duration_s, sample_rate, blob_hash, size_bytes FROM site_recordings WHERE session_id = ?',
      sessionId,
    );
    for (const recording of recordings) {
      const body = mutation('site_recording', recording.id, 0, {
        sessionId,
        site: recording.site,
        outcome: recording.outcome,
        source: recording.source,
        skipReason: recording.skip_reason,
        note: recording.note,
        verdict: recording.verdict,
        heartRateBpm: recording.heart_rate_bpm,
        durationS: recording.duration_s,
        sampleRate: recording.sample_rate,
        blobHash: recording.blob_hash,
      });
      await enqueue(db, { kind: 'mutation', entity: 'site_recording', rowId: recording.id, mutation: body, sizeBytes: JSON.stringify(body).length, label: `${siteInfo(recording.site).label} record · ${who}` }, now);
    }
    for (const clip of sealed) {
      await enqueue(db, { kind: 'clip', rowId: clip.id, blobHash: clip.hash, sizeBytes: clip.sealed.byteLength, label: `${siteInfo(clip.site).label} clip (sealed) · ${who}` }, now);
    }
  });
  // Rebuild the file so no page of the old plaintext survives (secure_delete already zeroes freed cells).
  await write((db) => db.execAsync('VACUUM')).catch(() => undefined);
  return { clips: sealed.length };
}
