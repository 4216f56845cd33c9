import type { SyncEntity } from '@/shared/protocol/sync';

export const entityWords: Record<SyncEntity, string> = {
  clients: 'Client record',
  consents: 'Consent',
  recording_sessions: 'Session',
  site_recordings: 'Site recording',
};

const fieldWords: Record<string, string> = {
  firstName: 'First name',
  lastName: 'Last name',
  dateOfBirth: 'Date of birth',
  email: 'E-mail',
  phone: 'Phone',
  notes: 'Notes',
  clientId: 'Client',
  consentTextId: 'Consent text',
  consentTextVersion: 'Consent text version',
  typedName: 'Typed name',
  consentDate: 'Consent date',
  status: 'Status',
  startedAt: 'Started',
  finishedAt: 'Finished',
  findings: 'Findings',
  plan: 'Plan',
  followUpDate: 'Follow-up date',
  sessionId: 'Session',
  site: 'Site',
  qualityVerdict: 'Quality verdict',
  clipSha256: 'Clip (sha256)',
  durationS: 'Duration (s)',
  recordedAt: 'Recorded',
  skippedReason: 'Reason skipped',
  keepAnywayNote: 'Kept-anyway note',
  deletedAt: 'Deleted',
  recordedBy: 'Recorded by',
  operatorId: 'Operator',
  reviewedBy: 'Reviewed by',
  reviewedAt: 'Reviewed',
  clipState: 'Clip state',
};

export function fieldLabel(field: string): string {
  return fieldWords[field] ?? field.replace(/([A-Z])/g, ' $1').replace(/^./, (c) => c.toUpperCase());
}

/** Values as an admin reads them; an empty value says so rather than showing nothing. */
export function valueText(field: string, value: unknown): string {
  if (field === 'deletedAt')
    return value ? `Deleted ${String(value).slice(0, 16).replace('T', ' ')}` : 'Not deleted';
  if (value === null || value === undefined || value === '') return '(empty)';
  if (typeof value === 'string') {
    if (/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(value)) return value.slice(0, 16).replace('T', ' ');
    return value;
  }
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  return JSON.stringify(value);
}

export const shortDevice = (deviceId: string | null) =>
  deviceId ? `device ${deviceId.slice(0, 8)}` : 'unknown device';

const pad = (n: number) => String(n).padStart(2, '0');

/** Local date and time of the device reading it, e.g. "2026-12-01 14:05". */
export function whenText(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${pad(d.getHours())}:${pad(d.getMinutes())}`;
}
