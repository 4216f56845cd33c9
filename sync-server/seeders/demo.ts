// An invented clinic for `npm start`: every name, visit and clip here is made up.
import type { Sequelize, Transaction } from 'sequelize';
import { v5 as uuidv5 } from 'uuid';
import { SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import type { Role, Site } from '@/shared/protocol';
import { encodeWav16, type AnalysisResult } from '@/shared/analysis';
import { execute, selectRows } from '../src/repositories/sql';
import { createUser, findUserForRefreshToken, setPasswordHash } from '../src/repositories/users-repository';
import type { BlobStore } from '../src/services/blob-store';
import { hashPassword, verifyPassword } from '../src/services/passwords';
import { pushChanges } from '../src/use-cases/sync/push';
import { synthesizeHeartSounds } from './synthetic-heart-sounds';

const NAMESPACE = '5b0d1c3e-7a52-4f7e-9a63-2f4b8c1d9e70';
export const demoId = (name: string) => uuidv5(`fourpoint-demo/${name}`, NAMESPACE);
export const DEMO_CLINIC_ID = demoId('clinic');
const SEED_LOCK_KEY = 4_207_118;

const SITES: readonly Site[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

export const DEMO_USERS: readonly { key: string; role: Role; email: string; name: string }[] = [
  { key: 'operator', role: 'operator', email: 'operator@demo.fourpoint.test', name: 'Rowan Ashby' },
  {
    key: 'practitioner',
    role: 'practitioner',
    email: 'practitioner@demo.fourpoint.test',
    name: 'Mira Castellan',
  },
  { key: 'admin', role: 'admin', email: 'admin@demo.fourpoint.test', name: 'Theo Lindqvist' },
];

const CONSENT_TEXT = [
  'I agree that Harbour Lane Wellness records the sounds of my heart at four places on my chest and keeps the recordings',
  'and their measurements with my client record, to follow how they change over my visits.',
  'I understand that this is for wellness follow-up only: it is not a diagnostic test and does not diagnose, treat or',
  'prevent disease, and anything unusual will be shown to me as a reason to see a licensed clinician.',
  'I can ask for a copy of my data, or for it to be erased, at any time.',
].join(' ');

interface DemoVisit {
  date: string;
  bpm: number;
  s1s2Scale: number;
  systolicHum: number;
  reviewed: boolean;
  findings?: string;
  plan?: string;
  followUp?: string;
  /** A site left out of this visit, with the operator's reason. */
  skipped?: { site: Site; reason: string };
}

interface DemoClient {
  key: string;
  firstName: string;
  lastName: string;
  dateOfBirth: string;
  email: string;
  consent: boolean;
  visits: DemoVisit[];
}

const DEMO_CLIENTS: readonly DemoClient[] = [
  {
    key: 'wren-halloway',
    firstName: 'Wren',
    lastName: 'Halloway',
    dateOfBirth: '1979-04-12',
    email: 'wren.halloway@example.test',
    consent: true,
    // Drifts over the series: rate up, S1 softer, a little more between the sounds.
    visits: [
      {
        date: '2026-05-06',
        bpm: 64,
        s1s2Scale: 1.1,
        systolicHum: 0,
        reviewed: true,
        findings: 'Clear traces at all four sites.',
        plan: 'Repeat in six to eight weeks.',
        followUp: '2026-07-01',
      },
      {
        date: '2026-07-01',
        bpm: 69,
        s1s2Scale: 1.0,
        systolicHum: 0.03,
        reviewed: true,
        findings: 'Rate a little higher than in May.',
        plan: 'Repeat in eight weeks.',
        followUp: '2026-08-26',
      },
      {
        date: '2026-08-26',
        bpm: 74,
        s1s2Scale: 0.9,
        systolicHum: 0.06,
        reviewed: true,
        findings: 'Rate keeps rising across visits.',
        plan: 'Repeat in six weeks; refer to a licensed clinician if the trend continues.',
        followUp: '2026-10-07',
      },
      { date: '2026-10-07', bpm: 79, s1s2Scale: 0.8, systolicHum: 0.09, reviewed: false },
    ],
  },
  {
    key: 'tobias-fenwright',
    firstName: 'Tobias',
    lastName: 'Fenwright',
    dateOfBirth: '1988-11-30',
    email: 'tobias.fenwright@example.test',
    consent: true,
    visits: [
      {
        date: '2026-06-17',
        bpm: 71,
        s1s2Scale: 1,
        systolicHum: 0,
        reviewed: true,
        findings: 'Steady rhythm.',
        plan: 'Repeat in three months.',
        followUp: '2026-09-16',
      },
      {
        date: '2026-09-16',
        bpm: 70,
        s1s2Scale: 1,
        systolicHum: 0,
        reviewed: true,
        findings: 'Much like June.',
        plan: 'Repeat in three months.',
        followUp: '2026-12-16',
        skipped: { site: 'pulmonic', reason: 'Client asked to stop early.' },
      },
      { date: '2026-11-04', bpm: 72, s1s2Scale: 1, systolicHum: 0, reviewed: false },
    ],
  },
  {
    key: 'ines-marlowe-quist',
    firstName: 'Ines',
    lastName: 'Marlowe-Quist',
    dateOfBirth: '1965-02-08',
    email: 'ines.mq@example.test',
    consent: true,
    visits: [
      {
        date: '2026-08-12',
        bpm: 62,
        s1s2Scale: 1,
        systolicHum: 0,
        reviewed: true,
        findings: 'Slow, even rate.',
        plan: 'Repeat in four months.',
        followUp: '2026-12-09',
      },
      { date: '2026-11-18', bpm: 63, s1s2Scale: 1, systolicHum: 0, reviewed: false },
    ],
  },
  {
    key: 'callum-brightwater',
    firstName: 'Callum',
    lastName: 'Brightwater',
    dateOfBirth: '1992-07-21',
    email: 'callum.b@example.test',
    consent: true,
    // One visit with a rate above the default range and more sound between S1 and S2, so the demo has a session
    // flagged for referral to review.
    visits: [{ date: '2026-11-25', bpm: 108, s1s2Scale: 1, systolicHum: 0.3, reviewed: false }],
  },
  {
    key: 'saoirse-pendleford',
    firstName: 'Saoirse',
    lastName: 'Pendleford',
    dateOfBirth: '1983-09-03',
    email: 'saoirse.p@example.test',
    consent: true,
    visits: [],
  },
  // No consent on file: the operator's flow asks for it first.
  {
    key: 'anselm-kettleby',
    firstName: 'Anselm',
    lastName: 'Kettleby',
    dateOfBirth: '1971-12-15',
    email: 'anselm.k@example.test',
    consent: false,
    visits: [],
  },
];

export type AnalyseClip = (samples: Float32Array, sampleRate: number, site: Site) => AnalysisResult;

export interface SeedDemoOptions {
  sequelize: Sequelize;
  blobStore: BlobStore;
  /** The demo users' sign-in password: each install (and test run) makes its own, none is published. */
  password: string;
  /** The server's analysis of record; when absent, analysis and verdict stay empty. */
  analyse?: AnalyseClip;
  log?: (message: string) => void;
}

export interface SeedDemoSummary {
  created: number;
}

/** One `INSERT … ON CONFLICT (id) DO NOTHING RETURNING id`: true when the row was added, false when it was there. */
const insertedOnce = async (
  sequelize: Sequelize,
  sql: string,
  replacements: Record<string, unknown>,
  transaction: Transaction,
) => (await selectRows(sequelize, sql, replacements, transaction)).length === 1;

const stableSeed = (text: string) => {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h >>> 0;
};

/** Loads the demo clinic; every row has a fixed id, so a second run finds them all and adds nothing. */
export async function seedDemo(options: SeedDemoOptions): Promise<SeedDemoSummary> {
  const { sequelize } = options;
  let created = 0;
  const count = (wasCreated: boolean) => {
    if (wasCreated) created++;
  };

  const passwordHash = await hashPassword(options.password);
  const userIds: Record<string, string> = {};
  // One transaction under a lock: two processes seeding at once take turns, and a crash leaves no half-loaded clinic.
  await sequelize.transaction(async (transaction) => {
    await sequelize.query(`SELECT pg_advisory_xact_lock(${SEED_LOCK_KEY})`, { transaction });
    // Not createClinic: the demo clinic's consent wording is its own version 1, not the built-in one.
    count(
      await insertedOnce(
        sequelize,
        `INSERT INTO clinics (id, name) VALUES (:id, :name) ON CONFLICT (id) DO NOTHING RETURNING id`,
        { id: DEMO_CLINIC_ID, name: 'Harbour Lane Wellness' },
        transaction,
      ),
    );
    for (const u of DEMO_USERS) {
      const id = demoId(`user/${u.key}`);
      userIds[u.key] = id;
      const made =
        (
          await createUser(
            sequelize,
            DEMO_CLINIC_ID,
            { id, email: u.email, name: u.name, role: u.role, passwordHash },
            transaction,
          )
        ).kind === 'created';
      count(made);
      // Demo users loaded by an older version have the password that was once published in the code.
      const user = made ? null : await findUserForRefreshToken(sequelize, id, transaction);
      if (user && !(await verifyPassword(options.password, user.passwordHash)).ok)
        await setPasswordHash(sequelize, id, passwordHash, transaction);
    }
    const textId = demoId('consent-text/1');
    count(
      await insertedOnce(
        sequelize,
        `INSERT INTO consent_texts (id, clinic_id, version, title, body, is_current)
         VALUES (:id, :clinicId, 1, :title, :body, true) ON CONFLICT (id) DO NOTHING RETURNING id`,
        { id: textId, clinicId: DEMO_CLINIC_ID, title: 'Heart-sound recording consent', body: CONSENT_TEXT },
        transaction,
      ),
    );
    for (const c of DEMO_CLIENTS) {
      const clientId = demoId(`client/${c.key}`);
      count(
        await insertedOnce(
          sequelize,
          `INSERT INTO clients (id, clinic_id, first_name, last_name, date_of_birth, email)
           VALUES (:id, :clinicId, :firstName, :lastName, :dateOfBirth, :email) ON CONFLICT (id) DO NOTHING RETURNING id`,
          {
            id: clientId,
            clinicId: DEMO_CLINIC_ID,
            firstName: c.firstName,
            lastName: c.lastName,
            dateOfBirth: c.dateOfBirth,
            email: c.email,
          },
          transaction,
        ),
      );
      if (c.consent) {
        count(
          await insertedOnce(
            sequelize,
            `INSERT INTO consents (id, clinic_id, client_id, consent_text_id, consent_text_version, typed_name,
               consent_date, recorded_by)
             VALUES (:id, :clinicId, :clientId, :textId, 1, :typedName, :consentDate, :recordedBy)
             ON CONFLICT (id) DO NOTHING RETURNING id`,
            {
              id: demoId(`consent/${c.key}`),
              clinicId: DEMO_CLINIC_ID,
              clientId,
              textId,
              typedName: `${c.firstName} ${c.lastName}`,
              consentDate: c.visits[0]?.date ?? '2026-09-01',
              recordedBy: userIds.operator,
            },
            transaction,
          ),
        );
      }
    }
    for (const c of DEMO_CLIENTS) {
      for (const [index, visit] of c.visits.entries()) {
        created += await seedVisit(options, c, index, visit, userIds, transaction);
      }
    }
  });

  created += await seedDemoConflict(sequelize, userIds.operator!);

  options.log?.(created ? `Demo data: ${created} rows added or repaired.` : 'Demo data: already loaded.');
  return { created };
}

const demoClip = (client: DemoClient, index: number, visit: DemoVisit, site: Site) =>
  synthesizeHeartSounds({
    seed: stableSeed(`${client.key}/${index}/${site}`),
    site,
    bpm: visit.bpm,
    s1s2Scale: visit.s1s2Scale,
    systolicHum: visit.systolicHum,
  });

/**
 * A visit already loaded: rewrite clip files that have gone missing (the generator is deterministic, so the
 * bytes hash the same) and add the analysis where an earlier run had none.
 */
async function repairVisit(
  options: SeedDemoOptions,
  client: DemoClient,
  index: number,
  visit: DemoVisit,
  sessionId: string,
  transaction: Transaction,
): Promise<number> {
  const { sequelize } = options;
  let repaired = 0;
  const recordings = await selectRows<{
    id: string;
    site: Site;
    clip_sha256: string | null;
    has_analysis: boolean;
    storage_key: string | null;
  }>(
    sequelize,
    `SELECT r.id, r.site, r.clip_sha256, r.analysis IS NOT NULL AS has_analysis, b.storage_key
     FROM site_recordings r LEFT JOIN clip_blobs b ON b.sha256 = r.clip_sha256
     WHERE r.session_id = :sessionId AND r.clinic_id = :clinicId AND r.deleted_at IS NULL`,
    { sessionId, clinicId: DEMO_CLINIC_ID },
    transaction,
  );
  for (const recording of recordings) {
    if (!recording.clip_sha256) continue;
    const fileMissing = !recording.storage_key || !(await options.blobStore.has(recording.storage_key));
    const analysisMissing = !recording.has_analysis && options.analyse !== undefined;
    if (!fileMissing && !analysisMissing) continue;
    const clip = demoClip(client, index, visit, recording.site);
    if (fileMissing) {
      const stored = await options.blobStore.put(encodeWav16(clip.samples, clip.sampleRate));
      if (stored.sha256 !== recording.clip_sha256)
        throw new Error(`Demo clip for ${recording.id} no longer matches its hash`);
    }
    if (analysisMissing && options.analyse) {
      const analysis = options.analyse(clip.samples, clip.sampleRate, recording.site);
      await execute(
        sequelize,
        `UPDATE site_recordings SET analysis = CAST(:analysis AS jsonb), quality_verdict = :verdict, updated_at = now()
         WHERE id = :id`,
        { id: recording.id, analysis: JSON.stringify(analysis), verdict: analysis.quality.verdict },
        transaction,
      );
      repaired++;
    }
  }
  return repaired;
}

interface PlannedRecording {
  site: Site;
  skippedReason?: string;
  stored?: { sha256: string; storageKey: string; sizeBytes: number };
  analysis?: ReturnType<AnalyseClip> | null;
  durationS?: number;
  recordedAt?: Date;
}

async function seedVisit(
  options: SeedDemoOptions,
  client: DemoClient,
  index: number,
  visit: DemoVisit,
  userIds: Record<string, string>,
  transaction: Transaction,
): Promise<number> {
  const sessionId = demoId(`session/${client.key}/${index}`);
  const { sequelize } = options;
  const existing = await selectRows(
    sequelize,
    `SELECT 1 FROM recording_sessions WHERE id = :sessionId`,
    { sessionId },
    transaction,
  );
  if (existing.length > 0) {
    return repairVisit(options, client, index, visit, sessionId, transaction);
  }
  const startedAt = new Date(`${visit.date}T10:00:00Z`);

  // Blobs are content-addressed, so a rerun after a crash rewrites the same files under the same names.
  const recordings: PlannedRecording[] = [];
  for (const [siteIndex, site] of SITES.entries()) {
    if (visit.skipped?.site === site) {
      recordings.push({ site, skippedReason: visit.skipped.reason });
      continue;
    }
    const clip = demoClip(client, index, visit, site);
    const wav = encodeWav16(clip.samples, clip.sampleRate);
    const stored = await options.blobStore.put(wav);
    const analysis = options.analyse ? options.analyse(clip.samples, clip.sampleRate, site) : null;
    recordings.push({
      site,
      stored,
      analysis,
      durationS: clip.samples.length / clip.sampleRate,
      recordedAt: new Date(startedAt.getTime() + (siteIndex + 1) * 90_000),
    });
  }

  await execute(
    sequelize,
    `INSERT INTO recording_sessions (id, clinic_id, client_id, operator_id, status, started_at, finished_at, findings,
       plan, follow_up_date, reviewed_by, reviewed_at)
     VALUES (:id, :clinicId, :clientId, :operatorId, :status, :startedAt, :finishedAt, :findings, :plan,
       :followUpDate, :reviewedBy, :reviewedAt)`,
    {
      id: sessionId,
      clinicId: DEMO_CLINIC_ID,
      clientId: demoId(`client/${client.key}`),
      operatorId: userIds.operator,
      status: visit.reviewed ? 'reviewed' : 'completed',
      startedAt,
      finishedAt: new Date(startedAt.getTime() + 8 * 60_000),
      findings: visit.findings ?? null,
      plan: visit.plan ?? null,
      followUpDate: visit.followUp ?? null,
      reviewedBy: visit.reviewed ? userIds.practitioner : null,
      reviewedAt: visit.reviewed ? new Date(startedAt.getTime() + 26 * 3600_000) : null,
    },
    transaction,
  );
  for (const r of recordings) {
    if (r.stored) {
      // Demo clips are stored as plain WAV; clips from devices arrive sealed.
      await execute(
        sequelize,
        `INSERT INTO clip_blobs (sha256, clinic_id, size_bytes, content_type, storage_key, state)
         VALUES (:sha256, :clinicId, :sizeBytes, 'audio/wav', :storageKey, 'stored') ON CONFLICT (sha256) DO NOTHING`,
        { ...r.stored, clinicId: DEMO_CLINIC_ID },
        transaction,
      );
    }
    await execute(
      sequelize,
      `INSERT INTO site_recordings (id, clinic_id, session_id, site, clip_sha256, clip_state, duration_s, recorded_at,
         analysis, quality_verdict, skipped_reason)
       VALUES (:id, :clinicId, :sessionId, :site, :clipSha256, :clipState, :durationS, :recordedAt,
         CAST(:analysis AS jsonb), :qualityVerdict, :skippedReason)`,
      {
        id: demoId(`site-recording/${client.key}/${index}/${r.site}`),
        clinicId: DEMO_CLINIC_ID,
        sessionId,
        site: r.site,
        clipSha256: r.stored?.sha256 ?? null,
        clipState: r.stored ? 'stored' : 'none',
        durationS: r.durationS ?? null,
        recordedAt: r.recordedAt ?? null,
        analysis: r.analysis ? JSON.stringify(r.analysis) : null,
        qualityVerdict: r.analysis?.quality.verdict ?? null,
        skippedReason: r.skippedReason ?? null,
      },
      transaction,
    );
  }
  return 1 + recordings.length;
}

/**
 * The front-desk phone adds Saoirse Pendleford's number while a treatment-room phone, offline on the same version
 * of her record, changes her number and e-mail: the second push arrives as a conflict for the admin to settle.
 * Both go through the real sync push with fixed mutation ids, so seeding again replays them and adds nothing.
 */
async function seedDemoConflict(sequelize: Sequelize, operatorId: string): Promise<number> {
  const clientId = demoId('client/saoirse-pendleford');
  const [client] = await selectRows<{ version: number }>(
    sequelize,
    `SELECT version FROM clients WHERE id = :clientId AND deleted_at IS NULL`,
    { clientId },
  );
  if (!client) return 0;
  const caller = { userId: operatorId, role: 'operator' as const, clinicId: DEMO_CLINIC_ID, ip: null };
  const push = async (device: string, mutation: string, change: Record<string, unknown>) =>
    (
      await pushChanges(sequelize, caller, {
        protocolVersion: SYNC_PROTOCOL_VERSION,
        deviceId: demoId(`device/${device}`),
        mutations: [
          {
            mutationId: demoId(`mutation/${mutation}`),
            entity: 'clients',
            id: clientId,
            baseVersion: client.version,
            change,
          },
        ],
      })
    ).results[0];
  let made = 0;
  const frontDesk = await push('front-desk', 'pendleford-phone', { phone: '555 0172' });
  if (frontDesk?.status === 'applied') made++;
  const room = await push('treatment-room-2', 'pendleford-contact', {
    phone: '555 0138',
    email: 'saoirse.pendleford@example.test',
  });
  if (room?.status === 'conflict') made++;
  return made;
}
