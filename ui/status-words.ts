import type { SessionStatus } from '@/shared/protocol';
import type { InvitationStatus, PaymentStatus } from '@/shared/protocol/practice';
import type { ReportMailState } from '@/shared/protocol/review';
import type { BadgeTone } from './badge';

type Look = { label: string; tone: BadgeTone };

/**
 * The one word for each state a person sees, the same for the admin, the practitioner and the operator. A screen
 * that shows a state takes its word from here, never from the stored value.
 */
export const visitStatusWords: Record<SessionStatus, Look> = {
  in_progress: { label: 'In progress', tone: 'neutral' },
  completed: { label: 'Ready for review', tone: 'caution' },
  reviewed: { label: 'Reviewed', tone: 'good' },
  cancelled: { label: 'Cancelled', tone: 'neutral' },
};

export const invitationStatusWords: Record<InvitationStatus, Look> = {
  pending: { label: 'Waiting', tone: 'neutral' },
  accepted: { label: 'Joined', tone: 'good' },
  expired: { label: 'Expired', tone: 'caution' },
  revoked: { label: 'Withdrawn', tone: 'caution' },
};

export const paymentStatusWords: Record<PaymentStatus, Look> = {
  pending: { label: 'Waiting for payment', tone: 'neutral' },
  paid: { label: 'Paid', tone: 'good' },
  failed: { label: 'Did not go through', tone: 'danger' },
  refunded: { label: 'Refunded', tone: 'caution' },
  expired: { label: 'Link expired', tone: 'neutral' },
};

export const packageStatusWords: Record<'active' | 'refunded', Look> = {
  active: { label: 'In use', tone: 'good' },
  refunded: { label: 'Refunded', tone: 'danger' },
};

/** A report e-mailed to a client, from the moment it is asked for until the mail server takes it. */
export const reportMailStatusWords: Record<ReportMailState, Look> = {
  queued: { label: 'Waiting to send', tone: 'neutral' },
  sending: { label: 'Sending', tone: 'caution' },
  sent: { label: 'Sent', tone: 'good' },
  failed: { label: 'Not delivered', tone: 'danger' },
};

/** A sync conflict: open until an admin decides, then settled. */
export const conflictStatusWords: Record<'open' | 'resolved', Look> = {
  open: { label: 'To settle', tone: 'caution' },
  resolved: { label: 'Settled', tone: 'good' },
};

/** For a visit state that arrives as plain text (the client record's history). */
export function visitStatusLook(status: string): Look {
  return status in visitStatusWords
    ? visitStatusWords[status as SessionStatus]
    : { label: 'State not known', tone: 'neutral' };
}
