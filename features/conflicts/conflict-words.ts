import { formatDateTime } from '@/ui/format';
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
  consentTextVersion: 'Consent wording',
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
  clipSha256: 'Recording',
  durationS: 'Length (seconds)',
  recordedAt: 'Recorded',
  skippedReason: 'Reason skipped',
  keepAnywayNote: 'Kept-anyway note',
  deletedAt: 'Deleted',
  recordedBy: 'Recorded by',
  operatorId: 'Operator',
  reviewedBy: 'Reviewed by',
  reviewedAt: 'Reviewed',
  clipState: 'Recording sent',
};

export function fieldLabel(field: string): string {
  return fieldWords[field] ?? field.replace(/([A-Z])/g, ' $1').replace(/^./, (c) => c.toUpperCase());
}

/** Values as an admin reads them; an empty value says so rather than showing nothing. */
export function valueText(field: string, value: unknown): string {
  if (field === 'deletedAt') return value ? `Deleted ${formatDateTime(String(value))}` : 'Not deleted';
  if (value === null || value === undefined || value === '') return '(empty)';
  if (typeof value === 'string') {
    if (/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(value)) return formatDateTime(value);
    return value;
  }
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  return JSON.stringify(value);
}

/** When something happened, in the product's one date format. */
export const whenText = formatDateTime;

/** Who made the change that met a newer one; the device is not something a practice names. */
export const changedBy = (name: string | null) => name ?? 'someone no longer on the team';
