import type { Writable } from 'node:stream';
import archiver from 'archiver';
import { cautionText } from '@/shared/cautions';
import { isSealed, openClip } from '@/shared/seal';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as records from '../../repositories/clients-repository';
import * as repo from '../../repositories/export-repository';
import { iso } from '../../repositories/sql';
import { renderReportPdf } from '../../services/report-pdf';
import { clientNotFound } from '../clients/client-records';
import { buildReportInput } from '../review/report';
import type { Caller, UseCaseDeps } from '../context';

// A leading = + - @ makes a spreadsheet run the cell as a formula; a quote mark keeps it text.
const cell = (value: unknown): string => {
  if (value === null || value === undefined) return '';
  let text = value instanceof Date ? value.toISOString() : String(value);
  if (/^[=+\-@\t\r]/.test(text) && !/^-?\d+(\.\d+)?$/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
};
export const toCsv = (header: string[], rows: unknown[][]) =>
  [header, ...rows].map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';

/** Every number in an analysis result, by its path (e.g. `heartRate.bpm`); long arrays such as traces are left out. */
export function flattenMeasurements(value: unknown, prefix = ''): [string, number | string | boolean][] {
  if (value === null || value === undefined) return [];
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'string') {
    return prefix ? [[prefix, value]] : [];
  }
  if (Array.isArray(value)) {
    if (value.length > 8) return [];
    return value.flatMap((v, i) => flattenMeasurements(v, `${prefix}[${i}]`));
  }
  if (typeof value === 'object') {
    return Object.entries(value as Record<string, unknown>).flatMap(([k, v]) =>
      flattenMeasurements(v, prefix ? `${prefix}.${k}` : k),
    );
  }
  return [];
}

const isWav = (bytes: Uint8Array) =>
  bytes.length > 12 &&
  String.fromCharCode(...bytes.subarray(0, 4)) === 'RIFF' &&
  String.fromCharCode(...bytes.subarray(8, 12)) === 'WAVE';

export type ExportSummary = { files: string[]; clipsIncluded: number; clipsMissing: number };

type ExportFile = { name: string; content: string | Buffer };
type ClientRow = NonNullable<Awaited<ReturnType<typeof records.findClientRow>>>;
type ConsentRows = Awaited<ReturnType<typeof records.listConsents>>;
type SessionRows = Awaited<ReturnType<typeof repo.exportSessions>>;
type SiteRows = Awaited<ReturnType<typeof repo.exportSiteRecordings>>;

/** The records as CSV: the client, their consents, their visits, and every measurement of every site. */
function recordFiles(
  client: ClientRow,
  consents: ConsentRows,
  sessions: SessionRows,
  sites: SiteRows,
): ExportFile[] {
  const clientCsv = toCsv(
    ['id', 'first_name', 'last_name', 'date_of_birth', 'email', 'phone', 'notes', 'created_at', 'updated_at'],
    [
      [
        client.id,
        client.first_name,
        client.last_name,
        client.date_of_birth,
        client.email,
        client.phone,
        client.notes,
        iso(client.created_at),
        iso(client.updated_at),
      ],
    ],
  );
  const consentsCsv = toCsv(
    ['id', 'typed_name', 'consent_date', 'consent_text_version', 'consent_text_title', 'recorded_at'],
    consents.map((k) => [
      k.id,
      k.typed_name,
      k.consent_date,
      k.consent_text_version,
      k.title,
      iso(k.created_at),
    ]),
  );
  const visitsCsv = toCsv(
    [
      'session_id',
      'status',
      'started_at',
      'finished_at',
      'operator',
      'reviewed_by',
      'reviewed_at',
      'findings',
      'plan',
      'follow_up_date',
    ],
    sessions.map((s) => [
      s.id,
      s.status,
      iso(s.started_at),
      iso(s.finished_at),
      s.operator_name,
      s.reviewer_name,
      iso(s.reviewed_at),
      s.findings,
      s.plan,
      s.follow_up_date,
    ]),
  );
  const measurementRows: unknown[][] = [];
  for (const r of sites) {
    measurementRows.push([r.session_id, r.site, iso(r.recorded_at), 'quality_verdict', r.quality_verdict]);
    measurementRows.push([r.session_id, r.site, iso(r.recorded_at), 'duration_s', r.duration_s]);
    if (r.skipped_reason)
      measurementRows.push([r.session_id, r.site, iso(r.recorded_at), 'skipped_reason', r.skipped_reason]);
    for (const [metric, value] of flattenMeasurements(r.analysis))
      measurementRows.push([r.session_id, r.site, iso(r.recorded_at), metric, value]);
  }
  return [
    { name: 'client.csv', content: clientCsv },
    { name: 'consents.csv', content: consentsCsv },
    { name: 'visits.csv', content: visitsCsv },
    {
      name: 'measurements.csv',
      content: toCsv(['session_id', 'site', 'recorded_at', 'measurement', 'value'], measurementRows),
    },
  ];
}

/** The kept clips opened as WAV; a clip that has not arrived or does not open is named in `missing` instead. */
async function clipFiles(
  deps: UseCaseDeps,
  clinicId: string,
  sites: SiteRows,
): Promise<{ files: ExportFile[]; missing: string[] }> {
  const { blobStore, clinicKeys } = deps.services;
  const files: ExportFile[] = [];
  const missing: string[] = [];
  for (const r of sites) {
    if (!r.clip_sha256) continue;
    const date = (iso(r.recorded_at) ?? '').slice(0, 10) || 'undated';
    let bytes: Uint8Array | null = r.storage_key ? await blobStore.get(r.storage_key) : null;
    if (bytes && isSealed(bytes)) {
      try {
        bytes = openClip(bytes, clinicKeys.privateKey(clinicId));
      } catch {
        bytes = null;
      }
    }
    if (bytes && isWav(bytes)) {
      files.push({ name: `clips/${date}-${r.site}-${r.id.slice(0, 8)}.wav`, content: Buffer.from(bytes) });
    } else {
      missing.push(
        `${date} ${r.site} (${r.id}): ${bytes ? 'the clip could not be opened as WAV' : 'the clip has not reached the server'}`,
      );
    }
  }
  return { files, missing };
}

/** The same report the practitioner downloads or e-mails, for every visit with findings, a plan or a review. */
async function reportFiles(deps: UseCaseDeps, caller: Caller, sessions: SessionRows): Promise<ExportFile[]> {
  const files: ExportFile[] = [];
  for (const s of sessions) {
    if (!s.findings && !s.plan && s.status !== 'reviewed') continue;
    const input = await buildReportInput(deps, caller, s.id, null);
    files.push({
      name: `reports/${input.sessionDay}-${s.id.slice(0, 8)}.pdf`,
      content: await renderReportPdf(input),
    });
  }
  return files;
}

const readme = (clinicName: string, missing: string[]): ExportFile => ({
  name: 'README.txt',
  content: [
    `Export of one client's data from ${clinicName}, made ${new Date().toISOString()}.`,
    '',
    'client.csv        the client record',
    'consents.csv      consents given, with the version of the consent text signed',
    'visits.csv        recording sessions with findings, plan and follow-up date',
    'measurements.csv  per site: quality verdict, duration and every measurement of the analysis of record',
    'clips/            the recorded clips as WAV',
    'reports/          the reports of reviewed sessions (PDF)',
    '',
    ...(missing.length ? ['Clips not included:', ...missing, ''] : []),
    cautionText,
    '',
  ].join('\r\n'),
});

/** Writes one client's data as a zip to `out`: CSV of records and measurements, WAV clips, PDF reports. */
export async function exportClient(
  deps: UseCaseDeps,
  caller: Caller,
  clientId: string,
  out: Writable,
): Promise<ExportSummary> {
  const client = await records.findClientRow(deps.sequelize, caller.clinicId, clientId);
  if (!client) throw clientNotFound();
  const [consents, sessions, sites, clinicName] = await Promise.all([
    records.listConsents(deps.sequelize, caller.clinicId, clientId),
    repo.exportSessions(deps.sequelize, caller.clinicId, clientId),
    repo.exportSiteRecordings(deps.sequelize, caller.clinicId, clientId),
    repo.clinicName(deps.sequelize, caller.clinicId),
  ]);
  // Logged before any byte leaves, so an export cut off half-way is on record too.
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'client.export',
    entity: 'client',
    entityId: clientId,
    ip: caller.ip,
  });
  const zip = archiver('zip', { zlib: { level: 6 } });
  const files: string[] = [];
  const add = (file: ExportFile) => {
    files.push(file.name);
    zip.append(file.content, { name: file.name });
  };
  const finished = new Promise<void>((resolve, reject) => {
    out.on('finish', resolve);
    out.on('close', resolve);
    zip.on('error', reject);
  });
  zip.pipe(out);

  recordFiles(client, consents, sessions, sites).forEach(add);
  const clips = await clipFiles(deps, caller.clinicId, sites);
  clips.files.forEach(add);
  (await reportFiles(deps, caller, sessions)).forEach(add);
  add(readme(clinicName, clips.missing));
  await zip.finalize();
  await finished;
  return { files, clipsIncluded: clips.files.length, clipsMissing: clips.missing.length };
}
