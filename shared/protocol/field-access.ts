import type { Role } from './auth';
import type { SyncEntity, serverOwnedFields, syncFieldSchemas } from './sync';

type DeviceField<E extends SyncEntity> = keyof (typeof syncFieldSchemas)[E]['shape'] & string;
type ServerField<E extends SyncEntity> = (typeof serverOwnedFields)[E][number];
/** Every field of a synced row: what devices write, what the server fills, and the tombstone. */
export type SyncField<E extends SyncEntity> = DeviceField<E> | ServerField<E> | 'deletedAt';

export interface FieldRule {
  /** Roles whose pull carries the field. */
  read: readonly Role[];
  /** Roles whose change (sync push or REST route) may set the field; empty when only the server sets it. */
  write: readonly Role[];
  /**
   * For a field whose values mean different steps of the work: the values each writing role may set. A role
   * listed in `write` but not here may set none; a field without `values` takes any value its schema allows.
   */
  values?: Partial<Record<Role, readonly string[]>>;
}

const everyone = ['operator', 'practitioner', 'admin'] as const;
const reviewers = ['practitioner', 'admin'] as const;
const serverOnly = [] as const;

/** Client details: every role reads and writes them. */
const contactDetail = { read: everyone, write: everyone } as const;
/** What the phone captures: every role reads it, only an operator's phone writes it. */
const captured = { read: everyone, write: ['operator'] } as const;
/** The tombstone: it reaches every device that holds the row; only an admin erases. */
const erasure = { read: everyone, write: ['admin'] } as const;

/**
 * Who may read and write each field of each synced row. Operators capture on the phone (contact details, consent,
 * sessions, site recordings) and read back only what capture needs; practitioners write the clinical side
 * (findings, plan, follow-up, client notes); admins manage (client details, erasure) and read everything.
 * A tombstone reaches every device that holds the row, so every role reads `deletedAt`.
 * Typed so that a field added to a sync schema without a line here fails the typecheck.
 */
export const fieldAccess = {
  clients: {
    firstName: contactDetail,
    lastName: contactDetail,
    dateOfBirth: contactDetail,
    email: contactDetail,
    phone: contactDetail,
    // The practice's notes on the client are clinical; the phone neither shows nor writes them.
    notes: { read: reviewers, write: reviewers },
    deletedAt: erasure,
  },
  consents: {
    clientId: captured,
    consentTextId: captured,
    consentTextVersion: captured,
    // A signed consent is a record of what the client signed: nobody edits it afterwards, only the phone creates it.
    typedName: captured,
    consentDate: captured,
    recordedBy: { read: reviewers, write: serverOnly },
    deletedAt: erasure,
  },
  recording_sessions: {
    clientId: captured,
    // The phone starts, finishes or cancels a visit; only a practitioner marks it reviewed (completed -> reviewed).
    status: {
      read: everyone,
      write: ['operator', 'practitioner'],
      values: {
        operator: ['in_progress', 'completed', 'cancelled'],
        practitioner: ['reviewed', 'cancelled'],
      },
    },
    startedAt: captured,
    finishedAt: captured,
    findings: { read: reviewers, write: ['practitioner'] },
    plan: { read: reviewers, write: ['practitioner'] },
    // The phone books the next visit, so it reads when one is due (as GET /api/follow-ups/due shows every role).
    followUpDate: { read: everyone, write: ['practitioner'] },
    operatorId: { read: everyone, write: serverOnly },
    reviewedBy: { read: reviewers, write: serverOnly },
    reviewedAt: { read: reviewers, write: serverOnly },
    deletedAt: erasure,
  },
  site_recordings: {
    sessionId: captured,
    site: captured,
    qualityVerdict: captured,
    clipSha256: captured,
    durationS: captured,
    recordedAt: captured,
    skippedReason: captured,
    keepAnywayNote: captured,
    // Large, and the review routes serve it to practitioners and admins: no pull carries it.
    analysis: { read: serverOnly, write: serverOnly },
    clipState: { read: everyone, write: serverOnly },
    deletedAt: erasure,
  },
} as const satisfies {
  [E in SyncEntity]: { [F in SyncField<E>]: FieldRule } & { deletedAt: { read: typeof everyone } };
};

const rulesOf = (entity: SyncEntity) => fieldAccess[entity] as Record<string, FieldRule>;

/** The data fields a role's pull carries for an entity (the tombstone travels beside them, not in them). */
export function readableFields(role: Role, entity: SyncEntity): string[] {
  return Object.entries(rulesOf(entity))
    .filter(([field, rule]) => field !== 'deletedAt' && rule.read.includes(role))
    .map(([field]) => field);
}

/** Own keys only: a field named `constructor` or `__proto__` is nobody's to write. */
export function mayWriteField(role: Role, entity: SyncEntity, field: string): boolean {
  const rules = rulesOf(entity);
  return Object.hasOwn(rules, field) && rules[field].write.includes(role);
}

const capitalised = (word: string) => `${word[0]!.toUpperCase()}${word.slice(1)}`;
const valueWords = (value: unknown) => String(value).replace(/_/g, ' ');

const entityWords: Record<SyncEntity, string> = {
  clients: 'a client',
  consents: 'a consent',
  recording_sessions: 'a session',
  site_recordings: 'a site recording',
};
const fieldWords = (field: string) =>
  field === 'deletedAt' ? 'deletion' : field.replace(/[A-Z]/g, (c) => ` ${c.toLowerCase()}`);
const roleWords = (roles: readonly string[]) => roles.map((r) => `${r}s`).join(' or ');
const listWords = (items: string[], joiner = 'and') =>
  items.length < 2 ? items.join('') : `${items.slice(0, -1).join(', ')} ${joiner} ${items[items.length - 1]}`;

/**
 * Null when the role may write every one of the fields; otherwise why not, in words for the person whose change
 * it was (shown on their device beside the change).
 */
export function fieldWriteRefusal(role: Role, entity: SyncEntity, fields: readonly string[]): string | null {
  const refused = fields.filter((f) => !mayWriteField(role, entity, f));
  if (refused.length === 0) return null;
  const rules = rulesOf(entity);
  const writers = [...new Set(refused.flatMap((f) => (Object.hasOwn(rules, f) ? rules[f].write : [])))];
  return (
    `${capitalised(role)}s may not change the ${listWords(refused.map(fieldWords))} of ` +
    `${entityWords[entity]}` +
    (writers.length ? `; only ${roleWords(writers)} do.` : '; the server sets it.') +
    ' This change was not applied.'
  );
}

/**
 * Null when the role may set every value the change carries; otherwise why not, in words. A null value writes
 * nothing (see the push), so it is never refused here.
 */
export function valueWriteRefusal(
  role: Role,
  entity: SyncEntity,
  change: Readonly<Record<string, unknown>>,
): string | null {
  const rules = rulesOf(entity);
  for (const [field, value] of Object.entries(change)) {
    const allowed = Object.hasOwn(rules, field) ? rules[field].values : undefined;
    if (!allowed || value === null || value === undefined) continue;
    const mine = allowed[role] ?? [];
    if (!mine.includes(String(value)))
      return (
        `${capitalised(role)}s may not set the ${fieldWords(field)} of ${entityWords[entity]} to ` +
        `“${valueWords(value)}”` +
        (mine.length
          ? `; they may set ${listWords(
              mine.map((v) => `“${valueWords(v)}”`),
              'or',
            )}.`
          : '.') +
        ' This change was not applied.'
      );
  }
  return null;
}
