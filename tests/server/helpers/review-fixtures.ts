import { randomUUID } from 'node:crypto';
import type { QualityVerdict, SessionStatus, Site } from '@/shared/protocol';
import { encodeWav16 } from '@/shared/analysis/wav';
import type { StoredAnalysis } from '@/shared/protocol/analysis';
import { insertClient } from '@/sync-server/src/repositories/clients-repository';
import { execute } from '@/sync-server/src/repositories/sql';
import type { BlobStore } from '@/sync-server/src/services/blob-store';
import { testDatabase } from './test-app';

export const SITES: readonly Site[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

export async function addClient(
  clinicId: string,
  firstName: string,
  lastName: string,
  email: string | null = null,
) {
  const id = randomUUID();
  await insertClient(testDatabase(), {
    id,
    clinicId,
    firstName,
    lastName,
    email,
    dateOfBirth: null,
    phone: null,
    notes: null,
  });
  return id;
}

export type SiteSpec = {
  verdict?: QualityVerdict | null;
  heartRateBpm?: number | null;
  irregular?: boolean;
  systolicActivity?: number | null;
  sounds?: { type: 'S1' | 'S2'; startS: number; endS: number }[];
  clip?: { sha256: string };
  /** The analysis's murmur screen; left out, the analysis has none (as analyses made before it had). */
  screen?: { murmur: 'possible' | 'unlikely' | 'unsure'; score: number; reasons: string[] };
};

/** An analysis of record in the shape the server stores (the analysis schema), with only what a test needs. */
export function analysisOf(spec: SiteSpec): StoredAnalysis {
  return {
    sampleRate: 4000,
    durationS: 4,
    heartRateBpm: spec.heartRateBpm ?? null,
    sounds: (spec.sounds ?? []).map((s) => ({ ...s, peakAmplitude: 1 })),
    metrics: {
      heartRateBpm: spec.heartRateBpm ?? null,
      sdnnMs: 30,
      rmssdMs: 25,
      pnn50: 5,
      irregularRhythm: spec.irregular ?? false,
      s1DurationMs: 110,
      s2DurationMs: 90,
      systoleMs: 320,
      diastoleMs: 500,
      systoleDiastoleRatio: 0.64,
      s1s2PeakRatio: 1.4,
      s1s2EnergyRatio: 1.8,
      systolicActivity: spec.systolicActivity ?? 0.1,
      diastolicActivity: 0.08,
      usableCycles: 5,
      beats: [],
    },
    quality: { verdict: spec.verdict ?? 'good', reasons: [] },
    analysisVersion: 'test',
    ...(spec.screen ? { screen: spec.screen } : {}),
  };
}

export async function addSession(options: {
  clinicId: string;
  clientId: string;
  operatorId?: string | null;
  startedAt: Date;
  status?: SessionStatus;
  sites?: Partial<Record<Site, SiteSpec>>;
  findings?: string | null;
}) {
  const id = randomUUID();
  const sequelize = testDatabase();
  await execute(
    sequelize,
    `INSERT INTO recording_sessions (id, clinic_id, client_id, operator_id, status, started_at, findings)
     VALUES (:id, :clinicId, :clientId, :operatorId, :status, :startedAt, :findings)`,
    {
      id,
      clinicId: options.clinicId,
      clientId: options.clientId,
      operatorId: options.operatorId ?? null,
      status: options.status ?? 'completed',
      startedAt: options.startedAt,
      findings: options.findings ?? null,
    },
  );
  const sites: Partial<Record<Site, SiteSpec>> =
    options.sites ?? Object.fromEntries(SITES.map((s) => [s, { verdict: 'good', heartRateBpm: 70 }]));
  for (const site of SITES) {
    const spec = sites[site];
    if (!spec) continue;
    await execute(
      sequelize,
      `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, analysis, clip_sha256, clip_state,
         duration_s)
       VALUES (:id, :clinicId, :sessionId, :site, :qualityVerdict, CAST(:analysis AS jsonb), :clipSha256, :clipState, 4)`,
      {
        id: randomUUID(),
        clinicId: options.clinicId,
        sessionId: id,
        site,
        qualityVerdict: spec.verdict === undefined ? 'good' : spec.verdict,
        analysis: JSON.stringify(analysisOf(spec)),
        clipSha256: spec.clip?.sha256 ?? null,
        clipState: spec.clip ? 'stored' : 'none',
      },
    );
  }
  return id;
}

/**
 * A 4 s, 4 kHz WAV with 50 ms bursts of a 100 Hz tone (inside the 25–400 Hz band) at known onsets and silence
 * elsewhere, so where the trace is loud can be checked against where the bursts are.
 */
export function burstWav(onsetsS: number[], salt = 0, sampleRate = 4000, durationS = 4): Uint8Array {
  const samples = new Float32Array(Math.round(sampleRate * durationS));
  // Blobs are addressed by content across clinics: a salt in the last sample keeps each test's clip its own.
  samples[samples.length - 1] = salt / 32768;
  for (const onset of onsetsS) {
    const start = Math.round(onset * sampleRate);
    for (let i = 0; i < 0.05 * sampleRate; i++)
      samples[start + i] = 0.8 * Math.sin((2 * Math.PI * 100 * i) / sampleRate);
  }
  return encodeWav16(samples, sampleRate);
}

export async function storeClip(
  blobStore: BlobStore,
  clinicId: string,
  wav: Uint8Array,
): Promise<{ sha256: string }> {
  const stored = await blobStore.put(wav);
  // Blobs are addressed by content across clinics: the same bytes stored again keep their first row.
  await execute(
    testDatabase(),
    `INSERT INTO clip_blobs (sha256, clinic_id, size_bytes, content_type, storage_key, state)
     VALUES (:sha256, :clinicId, :sizeBytes, 'audio/wav', :storageKey, 'stored') ON CONFLICT (sha256) DO NOTHING`,
    { ...stored, clinicId },
  );
  return { sha256: stored.sha256 };
}
