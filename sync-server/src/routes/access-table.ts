import type { Role } from '@/shared/protocol';
import * as h from './handlers';
import * as sync from './sync-handlers';
import * as r from './review-handlers';
import * as audit from './audit';
import * as clientsAdmin from './clients-admin';
import * as consent from './consent';
import * as exportRoutes from './export';
import * as followUps from './follow-ups';
import * as overview from './overview';
import * as passwordReset from './password-reset';
import * as payments from './payments';
import * as settings from './settings';
import * as team from './team';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
export type Access = 'public' | readonly Role[];

export interface RouteSpec {
  method: Method;
  path: string;
  access: Access;
  handler: h.HandlerFactory;
  /** Extra guard before the handler: the sign-in limiter (failures) or the password-reset one (every request). */
  limit?: 'sign-in' | 'password-reset';
  /** Path parameters named `id`/`…Id` that are not our rows' UUIDs (tus names its uploads itself); see row-ids.ts. */
  opaqueParams?: readonly string[];
}

// The roles by name, so that each row below reads as who may call it.
const anyRole: readonly Role[] = ['operator', 'practitioner', 'admin'];
const practitionerAndAdmin: readonly Role[] = ['practitioner', 'admin'];
const practitionerOnly: readonly Role[] = ['practitioner'];
const adminOnly: readonly Role[] = ['admin'];

/** One row of the table: method, path, who may call it, handler, then any guard or opaque parameter. */
const route = (
  method: Method,
  path: string,
  access: Access,
  handler: h.HandlerFactory,
  extra: Pick<RouteSpec, 'limit' | 'opaqueParams'> = {},
): RouteSpec => ({ method, path, access, handler, ...extra });

/**
 * Every API route and who may call it. The router is built from this table and nothing else,
 * and the role tests are generated from it, so a route cannot exist without a line here.
 */
export const accessTable: readonly RouteSpec[] = [
  route('get', '/api/health', 'public', h.health),
  route('get', '/api/health/live', 'public', h.healthLive),
  route('get', '/api/health/ready', 'public', h.healthReady),
  route('post', '/api/auth/sign-in', 'public', h.signInHandler, { limit: 'sign-in' }),
  route('post', '/api/auth/refresh', 'public', h.refreshHandler),
  route('post', '/api/auth/sign-out', 'public', h.signOutHandler),
  route('post', '/api/auth/password-reset', 'public', passwordReset.requestPasswordReset, {
    limit: 'password-reset',
  }),
  route('get', '/api/auth/password-reset/:token', 'public', passwordReset.previewPasswordReset),
  route('post', '/api/auth/password-reset/:token', 'public', passwordReset.completePasswordReset, {
    limit: 'sign-in',
  }),
  route('get', '/api/me', anyRole, h.me),
  route('get', '/api/clients', anyRole, h.clients),
  route('get', '/api/sessions', practitionerAndAdmin, h.sessions),
  // Sync: any signed-in device of the clinic pushes, pulls and uploads; conflicts are the admin's.
  route('post', '/api/sync/push', anyRole, sync.syncPush),
  route('post', '/api/sync/pull', anyRole, sync.syncPull),
  route('get', '/api/sync/blobs/:sha256', anyRole, sync.syncBlobStatus),
  route('post', '/api/sync/uploads', anyRole, sync.syncUploads),
  // Express answers HEAD (tus's offset check) through the GET route.
  route('get', '/api/sync/uploads/:id', anyRole, sync.syncUploads, { opaqueParams: ['id'] }),
  route('patch', '/api/sync/uploads/:id', anyRole, sync.syncUploads, { opaqueParams: ['id'] }),
  route('delete', '/api/sync/uploads/:id', anyRole, sync.syncUploads, { opaqueParams: ['id'] }),
  route('get', '/api/clinic/public-key', anyRole, sync.clinicPublicKey),
  route('get', '/api/admin/conflicts', adminOnly, sync.conflictList),
  route('get', '/api/admin/conflicts/:id', adminOnly, sync.conflictDetail),
  route('post', '/api/admin/conflicts/:id/resolve', adminOnly, sync.conflictResolve),
  // Review: operators record but never read findings; admins read, practitioners write and send.
  route('get', '/api/review/sessions', practitionerAndAdmin, r.reviewSessions),
  route('get', '/api/review/sessions/:sessionId', practitionerAndAdmin, r.reviewSession),
  route('get', '/api/review/sessions/:sessionId/sites/:site/trace', practitionerAndAdmin, r.reviewTrace),
  route('get', '/api/review/sessions/:sessionId/sites/:site/audio', practitionerAndAdmin, r.reviewAudio),
  route('get', '/api/review/sessions/:sessionId/earlier', practitionerAndAdmin, r.reviewEarlier),
  route('get', '/api/review/sessions/:sessionId/compare/:otherId', practitionerAndAdmin, r.reviewCompare),
  route('get', '/api/review/clients/:clientId/trends', practitionerAndAdmin, r.reviewTrends),
  route('put', '/api/review/sessions/:sessionId/notes', practitionerOnly, r.reviewSaveNotes),
  route('put', '/api/review/sessions/:sessionId/referral-flag', practitionerOnly, r.reviewSetReferralFlag),
  route(
    'get',
    '/api/review/sessions/:sessionId/report-mail-preview',
    practitionerOnly,
    r.reviewReportMailPreview,
  ),
  route('get', '/api/review/sessions/:sessionId/report', practitionerAndAdmin, r.reviewReportPdf),
  route('post', '/api/review/sessions/:sessionId/report-mails', practitionerOnly, r.reviewSendReport),
  route('get', '/api/review/sessions/:sessionId/report-mails', practitionerAndAdmin, r.reviewReportMails),
  route('post', '/api/review/report-mails/:mailId/retry', practitionerOnly, r.reviewRetryMail),
  route('get', '/api/admin/mailbox/messages', adminOnly, r.mailboxList),
  route('get', '/api/admin/mailbox/messages/:messageId', adminOnly, r.mailboxMessage),
  route('get', '/api/admin/mailbox/messages/:messageId/attachments/:index', adminOnly, r.mailboxAttachment),
  // The practice: team and invitations (admin; the invitee's link is public and signed).
  route('get', '/api/team', adminOnly, team.listTeam),
  route('post', '/api/team/invitations', adminOnly, team.invite),
  route('delete', '/api/team/invitations/:id', adminOnly, team.revokeInvitation),
  route('patch', '/api/team/users/:id', adminOnly, team.updateUser),
  route('get', '/api/invitations/:token', 'public', team.previewInvitation),
  route('post', '/api/invitations/:token/accept', 'public', team.acceptInvitation, { limit: 'sign-in' }),
  route('get', '/api/admin/attention', adminOnly, overview.attentionCounts),
  // Client records on the wide screen; export and erasure are the admin's alone.
  route('get', '/api/client-records', practitionerAndAdmin, clientsAdmin.clientTable),
  route('post', '/api/client-records', practitionerAndAdmin, clientsAdmin.createClient),
  route('get', '/api/client-records/:id', practitionerAndAdmin, clientsAdmin.clientRecord),
  route('patch', '/api/client-records/:id', practitionerAndAdmin, clientsAdmin.updateClient),
  route('get', '/api/client-records/:id/export', adminOnly, exportRoutes.exportZip),
  route('post', '/api/client-records/:id/erase', adminOnly, clientsAdmin.erase),
  route('get', '/api/consent-texts', anyRole, consent.listConsentTexts),
  route('post', '/api/consent-texts', adminOnly, consent.publishConsentText),
  // Follow-ups: everyone sees who is due; only the admin starts a reminder run by hand.
  route('get', '/api/follow-ups/due', anyRole, followUps.followUpsDue),
  route('post', '/api/follow-ups/reminders/run', adminOnly, followUps.runReminders),
  // Billing: the card is typed on the provider's page; the provider's webhook is public and signed.
  route('get', '/api/billing/payments', adminOnly, payments.listPayments),
  route('post', '/api/billing/payments', adminOnly, payments.createPayment),
  route('post', '/api/billing/payments/:id/refund', adminOnly, payments.refundPayment),
  route('post', '/webhooks/payments', 'public', payments.paymentWebhook),
  route('get', '/payments/complete', 'public', payments.paymentReturnPage),
  // Audit log: read only; there is deliberately no route that changes or removes an event.
  route('get', '/api/audit', adminOnly, audit.auditLog),
  // Clinic settings: everyone reads the ranges (review shows them); the admin changes them.
  route('get', '/api/settings', adminOnly, settings.getSettings),
  route('put', '/api/settings', adminOnly, settings.saveSettings),
  route('get', '/api/settings/ranges', anyRole, settings.getRanges),
  route('delete', '/api/settings/ranges', adminOnly, settings.resetAllRanges),
  route('put', '/api/settings/ranges/:metric/:site', adminOnly, settings.setRange),
  route('delete', '/api/settings/ranges/:metric/:site', adminOnly, settings.resetRange),
];
