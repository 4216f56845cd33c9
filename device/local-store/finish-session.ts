import { v4 as uuid } from 'uuid';
import { siteInfo } from '@/shared/sites';
import { readConsentTextIds } from '@/device/consent/clinic-consent-text';
import type { Mutation, SyncEntity } from '@/shared/protocol/sync';
import { sealClip, sha256Hex } from '@/shared/seal';
import type { Site } from '@/shared/protocol';
import { cachedClinicKey } from './clinic-key';
import { read, transaction, write } from './database';
import { clientChange, clientColumns, clientDetailsLabel, consentColumns } from './clients';
import type { LocalClient, LocalConsent, LocalSession } from './records';
import { sessionColumns } from './sessions';
import { enqueue } from './outbox';

export class MissingClinicKeyError extends Error {
  constructor() {
    super(
      'This device has not yet received the clinic’s sealing key, so the clips cannot be sealed. Connect to the clinic network once (open the outbox), then finish again; the recordings stay saved here.',
    );
    this.name = 'MissingClinicKeyError';
  }
}

export class MissingConsentWordingError extends Error {
  constructor() {
    super(
      'This device has not yet received the clinic’s consent wording, so the consent cannot be sent. Connect to the clinic network once (open the outbox), then finish again; the recordings stay saved here.',
    );
    this.name = 'MissingConsentWordingError';
  }
}

type PlainClip = { id: string; site: Site; clip_wav: Uint8Array };

/**
 * Seals every clip of the session for the clinic and queues the session's rows and clips. Sealing happens in
 * memory first; one transaction then stores the sealed blobs, drops the plaintext and queues everything, so a tab
 * closed half-way leaves the session open (and resumable) rather than half-sealed.
 */
/**
 * Fields the practice writes (shared/protocol/field-access.ts): a new row carries them empty; a change of a row
 * the server has leaves them out, since the server refuses an operator's change to them.
 */
const practiceFieldsOnCreate = (baseVersion: number, empty: Record<string, null>) =>
  baseVersion === 0 ? empty : {};

export async function finishSession(sessionId: string, now = new Date()): Promise<{ clips: number }> {
  const key = await cachedClinicKey();
  if (!key) throw new MissingClinicKeyError();
  // One clip per query: expo-sqlite's web worker returns blobs as views of SQLite's memory, so in a multi-row
  // read the later rows overwrite the bytes of the earlier ones.
  const plain = await read(async (db) => {
    const ids = await db.getAllAsync<{ id: string }>(
      "SELECT id FROM site_recordings WHERE session_id = ? AND outcome = 'recorded' AND clip_wav IS NOT NULL",
      sessionId,
    );
    const clips: PlainClip[] = [];
    for (const { id } of ids) {
      const row = await db.getFirstAsync<PlainClip>(
        'SELECT id, site, clip_wav FROM site_recordings WHERE id = ?',
        id,
      );
      if (row) clips.push({ ...row, clip_wav: new Uint8Array(row.clip_wav) });
    }
    return clips;
  });
  const sealed = plain.map((clip) => {
    const bytes = sealClip(new Uint8Array(clip.clip_wav), key);
    return { ...clip, sealed: bytes, hash: sha256Hex(bytes) };
  });
  const stamp = now.toISOString();
  // Read before the transaction: the consent row names the clinic's published text of the version signed.
  const consentTextIds = await readConsentTextIds();

  await transaction(async (db) => {
    const session = await db.getFirstAsync<LocalSession>(
      `SELECT ${sessionColumns} FROM sessions WHERE id = ?`,
      sessionId,
    );
    if (!session) throw new Error('This session is not on this device.');
    if (session.status !== 'in_progress') throw new Error('This session is already finished.');
    const client = await db.getFirstAsync<LocalClient>(
      `SELECT ${clientColumns} FROM clients WHERE id = ?`,
      session.clientId,
    );
    if (!client) throw new Error('The session’s client is missing on this device.');

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

    // Client, consent, session, site rows, then clips: parents ahead of children in the drain order.
    let order = 0;
    const queue = async (
      entity: SyncEntity,
      rowId: string,
      baseVersion: number,
      change: Record<string, unknown>,
      label: string,
      inSession: string | null = sessionId,
    ) => {
      const body: Mutation = { mutationId: uuid(), entity, id: rowId, baseVersion, change };
      await enqueue(
        db,
        {
          kind: 'mutation',
          entity,
          rowId,
          mutation: body,
          sizeBytes: JSON.stringify(body).length,
          label,
          clientId: session.clientId,
          sessionId: inSession,
        },
        now,
        order++,
      );
    };
    const alreadyQueued = async (entity: SyncEntity, rowId: string) =>
      Boolean(
        (
          await db.getFirstAsync<{ n: number }>(
            'SELECT count(*) AS n FROM outbox WHERE entity = ? AND row_id = ?',
            entity,
            rowId,
          )
        )?.n,
      );

    // Devices since the outbox's client column queue a new client when it is added; this covers older ones.
    if (client.origin === 'device' && !(await alreadyQueued('clients', session.clientId))) {
      await queue(
        'clients',
        session.clientId,
        client.version,
        clientChange(client, practiceFieldsOnCreate(client.version, { notes: null })),
        clientDetailsLabel,
        null,
      );
    }
    const consent = await db.getFirstAsync<LocalConsent & { version: number }>(
      `SELECT ${consentColumns}, version FROM consents WHERE id = ?`,
      session.consentId,
    );
    // A consent with a version came from the clinic server: it is there already.
    if (consent && consent.version === 0 && !(await alreadyQueued('consents', session.consentId))) {
      const consentTextId = consentTextIds[consent.textVersion];
      if (!consentTextId) throw new MissingConsentWordingError();
      await queue(
        'consents',
        session.consentId,
        0,
        {
          clientId: consent.clientId,
          consentTextId,
          consentTextVersion: Number(consent.textVersion),
          typedName: consent.signedName,
          consentDate: consent.signedOn,
        },
        'Consent',
      );
    }

    await db.runAsync(
      "UPDATE sessions SET status = 'completed', finished_at = ?, updated_at = ? WHERE id = ?",
      stamp,
      stamp,
      sessionId,
    );
    await queue(
      'recording_sessions',
      sessionId,
      session.version,
      {
        clientId: session.clientId,
        status: 'completed',
        startedAt: session.startedAt,
        finishedAt: stamp,
        ...practiceFieldsOnCreate(session.version, { findings: null, plan: null, followUpDate: null }),
      },
      'Session record',
    );

    const recordings = await db.getAllAsync<{
      id: string;
      site: Site;
      outcome: string;
      skip_reason: string | null;
      note: string | null;
      verdict: string | null;
      duration_s: number | null;
      blob_hash: string | null;
      updated_at: string;
    }>(
      'SELECT id, site, outcome, skip_reason, note, verdict, duration_s, blob_hash, updated_at FROM site_recordings WHERE session_id = ?',
      sessionId,
    );
    for (const r of recordings) {
      const recorded = r.outcome === 'recorded';
      await queue(
        'site_recordings',
        r.id,
        0,
        {
          sessionId,
          site: r.site,
          qualityVerdict: recorded ? r.verdict : null,
          clipSha256: r.blob_hash,
          durationS: recorded ? r.duration_s : null,
          recordedAt: recorded ? r.updated_at : null,
          skippedReason: recorded ? null : r.skip_reason,
          keepAnywayNote: r.note,
        },
        recorded ? `${siteInfo(r.site).label} details` : `${siteInfo(r.site).label} skipped`,
      );
    }
    for (const clip of sealed) {
      await enqueue(
        db,
        {
          kind: 'clip',
          rowId: clip.id,
          blobHash: clip.hash,
          sizeBytes: clip.sealed.byteLength,
          label: `${siteInfo(clip.site).label} recording`,
          clientId: session.clientId,
          sessionId,
        },
        now,
        order++,
      );
    }
  });
  // Rebuild the file so no page of the old plaintext survives (secure_delete already zeroes freed cells).
  await write((db) => db.execAsync('VACUUM')).catch(() => undefined);
  return { clips: sealed.length };
}
