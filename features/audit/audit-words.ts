import { formatMoney } from '@/features/billing/money';
import { roleLabels } from '@/features/nav/role-labels';
import type { Role, Site } from '@/shared/protocol';
import type { AuditEventRow } from '@/shared/protocol/practice';
import { sites } from '@/shared/sites';
import { erasedCountsWords } from '@/ui/result-words';

type Context = { currency: string | null };
type Sentence = (e: AuditEventRow, words: EventWords, context: Context) => string;

/** The names an event sentence is made of; a name the log cannot give has words of its own, never an id. */
type EventWords = { actor: string; client: string; clientsOwn: string; subject: string };

const possessive = (name: string) => (name.endsWith('s') ? `${name}’` : `${name}’s`);

function wordsOf(e: AuditEventRow): EventWords {
  const actor = e.userName ?? (e.userId ? 'A former team member' : 'Fourpoint');
  const client = e.clientName ?? (e.clientErased ? 'an erased client' : 'a client');
  return {
    actor,
    client,
    clientsOwn: e.clientName ? possessive(e.clientName) : `${client}’s`,
    subject: e.subjectName ?? 'a team member',
  };
}

const count = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : 0);
const roleWord = (v: unknown) =>
  typeof v === 'string' && v in roleLabels ? roleLabels[v as Role].toLowerCase() : 'team member';
const siteWord = (v: unknown) => sites.find((s) => s.id === (v as Site))?.label.toLowerCase() ?? 'one';
const amount = (v: unknown, c: Context) =>
  typeof v === 'number' && c.currency ? formatMoney(v, c.currency) : 'the amount';

function teamChange(e: AuditEventRow, w: EventWords): string {
  const d = e.details ?? {};
  const parts: string[] = [];
  const role = d.role as { from?: unknown; to?: unknown } | undefined;
  if (role && typeof role === 'object')
    parts.push(`made ${w.subject} ${roleWord(role.to)} (was ${roleWord(role.from)})`);
  if (d.disabled === true) parts.push(`turned off ${possessive(w.subject)} account`);
  if (d.disabled === false) parts.push(`turned ${possessive(w.subject)} account back on`);
  if (d.name !== undefined || parts.length === 0) parts.push(`changed ${possessive(w.subject)} details`);
  return `${w.actor} ${parts.join(' and ')}`;
}

/**
 * One sentence per kind of event, in the practice's words: who did what to whom. Kept beside the server's list of
 * kinds by audit-words.test.ts, which fails for a kind the server records that has no sentence here.
 */
export const auditSentences: Record<string, Sentence> = {
  'auth.sign_in': (_, w) => `${w.actor} signed in`,
  'auth.sign_out': (_, w) => `${w.actor} signed out`,
  'auth.sign_in_failed': (e, w) =>
    e.details?.reason === 'account disabled'
      ? `Someone tried to sign in to ${possessive(w.subject)} account, which is turned off`
      : `Someone tried to sign in to ${possessive(w.subject)} account with a wrong password`,
  'auth.password_reset_requested': (_, w) => `${w.subject} asked for a link to set a new password`,
  'auth.password_reset': (_, w) => `${w.subject} set a new password; other sign-ins were ended`,
  'team.invite': (e, w) => `${w.actor} invited ${w.subject} to join as ${roleWord(e.details?.role)}`,
  'team.invitation_accepted': (e, w) =>
    `${w.subject} accepted the invitation and joined as ${roleWord(e.details?.role)}`,
  'team.invitation_revoked': (_, w) => `${w.actor} withdrew the invitation to ${w.subject}`,
  'team.user_changed': (e, w) => teamChange(e, w),
  'client.create': (_, w) => `${w.actor} added ${w.client}`,
  'client.read': (_, w) => `${w.actor} opened the record of ${w.client}`,
  'client.update': (_, w) => `${w.actor} changed the details of ${w.client}`,
  'client.export': (_, w) => `${w.actor} exported the records of ${w.client}`,
  'client.erase': (e, w) => {
    const d = e.details ?? {};
    return `${w.actor} erased a client and their records: ${erasedCountsWords({
      visits: count(d.visits),
      recordings: count(d.recordings),
      consents: count(d.consents),
      reportEmails: count(d.reportEmails),
    })}`;
  },
  'client.purge': (_, w) => `The last traces of ${w.client} were removed, after the waiting period`,
  'review.session.read': (_, w) => `${w.actor} opened a visit of ${w.client}`,
  'review.session.compare': (_, w) => `${w.actor} compared two visits of ${w.client}`,
  'review.recording.play': (e, w) =>
    `${w.actor} listened to the ${siteWord(e.details?.site)} recording of ${w.client}`,
  'review.recording.trace': (e, w) =>
    `${w.actor} looked at the ${siteWord(e.details?.site)} trace of ${w.client}`,
  'review.client.trends': (_, w) => `${w.actor} looked at the trends of ${w.client}`,
  'review.findings.save': (_, w) => `${w.actor} saved findings for a visit of ${w.client}`,
  'review.referral.flag': (_, w) => `${w.actor} marked a visit of ${w.client} for referral`,
  'review.referral.clear': (_, w) => `${w.actor} cleared the referral mark on a visit of ${w.client}`,
  'review.report.download': (_, w) => `${w.actor} opened the report of ${w.client}`,
  'review.report.mail.sent': (e, w) =>
    e.details?.automatic === true
      ? `The report of ${w.client} was e-mailed on a later try`
      : `${w.actor} e-mailed the report to ${w.client}`,
  'review.report.mail.failed': (_, w) => `The report e-mail to ${w.client} could not be delivered`,
  'payment.create': (e, w, c) => `${w.actor} asked ${w.client} to pay ${amount(e.details?.amountCents, c)}`,
  'payment.paid': (e, w, c) => `${w.client} paid ${amount(e.details?.amountCents, c)}`,
  'payment.failed': (_, w) => `A card payment by ${w.client} did not go through`,
  'payment.refund_requested': (_, w) => `${w.actor} asked for a refund to ${w.client}`,
  'payment.refunded': (e, w, c) => `${amount(e.details?.amountCents, c)} was refunded to ${w.client}`,
  'settings.update': (_, w) => `${w.actor} changed the clinic’s settings`,
  'settings.range_set': (_, w) => `${w.actor} set one of the clinic’s own ranges`,
  'settings.range_reset': (e, w) =>
    e.entityId === 'all'
      ? `${w.actor} went back to the standard ranges for every measure`
      : `${w.actor} went back to the standard range for one measure`,
  'consent_text.publish': (e, w) =>
    `${w.actor} published a new consent wording${typeof e.details?.version === 'number' ? ` (version ${e.details.version})` : ''}; every client signs it at their next visit`,
  'sync.conflict.resolved': (e, w) =>
    e.clientId ? `${w.actor} settled a conflict in ${w.clientsOwn} records` : `${w.actor} settled a conflict`,
  'follow_up.reminders_run': (e, w) => {
    const sent = count(e.details?.sent);
    return `${w.actor} sent the due follow-up reminders (${sent} ${sent === 1 ? 'e-mail' : 'e-mails'})`;
  },
};

/** The sentence for one event; a kind the product has no words for yet still names who and whom. */
export function auditSentence(e: AuditEventRow, context: Context): string {
  const words = wordsOf(e);
  const sentence = auditSentences[e.action];
  if (sentence) return sentence(e, words, context);
  return e.clientName || e.clientErased
    ? `${words.actor} did something to the records of ${words.client}`
    : `${words.actor} did something the log has no words for yet`;
}

/** The kinds of event a person filters by; each is a prefix of the server's kinds. */
export const auditKinds: readonly { value: string; label: string }[] = [
  { value: 'auth', label: 'Sign-ins' },
  { value: 'client', label: 'Client records' },
  { value: 'review', label: 'Visits and reports' },
  { value: 'payment', label: 'Payments' },
  { value: 'team', label: 'Team' },
  { value: 'settings', label: 'Settings' },
  { value: 'consent_text', label: 'Consent wording' },
  { value: 'sync', label: 'Conflicts' },
  { value: 'follow_up', label: 'Follow-ups' },
];
