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

const anyRole: readonly Role[] = ['operator', 'practitioner', 'admin'];

/**
 * Every API route and who may call it. The router is built from this table and nothing else,
 * and the role tests are generated from it, so a route cannot exist without a line here.
 */
export const accessTable: readonly RouteSpec[] = [
  { method: 'get', path: '/api/health', access: 'public', handler: h.health },
  { method: 'get', path: '/api/health/live', access: 'public', handler: h.healthLive },
  { method: 'get', path: '/api/health/ready', access: 'public', handler: h.healthReady },
  { method: 'post', path: '/api/auth/sign-in', access: 'public', handler: h.signInHandler, limit: 'sign-in' },
  { method: 'post', path: '/api/auth/refresh', access: 'public', handler: h.refreshHandler },
  { method: 'post', path: '/api/auth/sign-out', access: 'public', handler: h.signOutHandler },
  {
    method: 'post',
    path: '/api/auth/password-reset',
    access: 'public',
    handler: passwordReset.requestPasswordReset,
    limit: 'password-reset',
  },
  {
    method: 'get',
    path: '/api/auth/password-reset/:token',
    access: 'public',
    handler: passwordReset.previewPasswordReset,
  },
  {
    method: 'post',
    path: '/api/auth/password-reset/:token',
    access: 'public',
    handler: passwordReset.completePasswordReset,
    limit: 'sign-in',
  },
  { method: 'get', path: '/api/me', access: anyRole, handler: h.me },
  { method: 'get', path: '/api/clients', access: ['operator', 'practitioner', 'admin'], handler: h.clients },
  { method: 'get', path: '/api/sessions', access: ['practitioner', 'admin'], handler: h.sessions },
  // Sync: any signed-in device of the clinic pushes, pulls and uploads; conflicts are the admin's.
  { method: 'post', path: '/api/sync/push', access: anyRole, handler: sync.syncPush },
  { method: 'post', path: '/api/sync/pull', access: anyRole, handler: sync.syncPull },
  { method: 'get', path: '/api/sync/blobs/:sha256', access: anyRole, handler: sync.syncBlobStatus },
  { method: 'post', path: '/api/sync/uploads', access: anyRole, handler: sync.syncUploads },
  // Express answers HEAD (tus's offset check) through the GET route.
  {
    method: 'get',
    path: '/api/sync/uploads/:id',
    access: anyRole,
    handler: sync.syncUploads,
    opaqueParams: ['id'],
  },
  {
    method: 'patch',
    path: '/api/sync/uploads/:id',
    access: anyRole,
    handler: sync.syncUploads,
    opaqueParams: ['id'],
  },
  {
    method: 'delete',
    path: '/api/sync/uploads/:id',
    access: anyRole,
    handler: sync.syncUploads,
    opaqueParams: ['id'],
  },
  { method: 'get', path: '/api/clinic/public-key', access: anyRole, handler: sync.clinicPublicKey },
  { method: 'get', path: '/api/admin/conflicts', access: ['admin'], handler: sync.conflictList },
  { method: 'get', path: '/api/admin/conflicts/:id', access: ['admin'], handler: sync.conflictDetail },
  {
    method: 'post',
    path: '/api/admin/conflicts/:id/resolve',
    access: ['admin'],
    handler: sync.conflictResolve,
  },
  // Review: operators record but never read findings; admins read, practitioners write and send.
  {
    method: 'get',
    path: '/api/review/sessions',
    access: ['practitioner', 'admin'],
    handler: r.reviewSessions,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId',
    access: ['practitioner', 'admin'],
    handler: r.reviewSession,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/sites/:site/trace',
    access: ['practitioner', 'admin'],
    handler: r.reviewTrace,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/sites/:site/audio',
    access: ['practitioner', 'admin'],
    handler: r.reviewAudio,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/earlier',
    access: ['practitioner', 'admin'],
    handler: r.reviewEarlier,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/compare/:otherId',
    access: ['practitioner', 'admin'],
    handler: r.reviewCompare,
  },
  {
    method: 'get',
    path: '/api/review/clients/:clientId/trends',
    access: ['practitioner', 'admin'],
    handler: r.reviewTrends,
  },
  {
    method: 'put',
    path: '/api/review/sessions/:sessionId/notes',
    access: ['practitioner'],
    handler: r.reviewSaveNotes,
  },
  {
    method: 'put',
    path: '/api/review/sessions/:sessionId/referral-flag',
    access: ['practitioner'],
    handler: r.reviewSetReferralFlag,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/report-mail-preview',
    access: ['practitioner'],
    handler: r.reviewReportMailPreview,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/report',
    access: ['practitioner', 'admin'],
    handler: r.reviewReportPdf,
  },
  {
    method: 'post',
    path: '/api/review/sessions/:sessionId/report-mails',
    access: ['practitioner'],
    handler: r.reviewSendReport,
  },
  {
    method: 'get',
    path: '/api/review/sessions/:sessionId/report-mails',
    access: ['practitioner', 'admin'],
    handler: r.reviewReportMails,
  },
  {
    method: 'post',
    path: '/api/review/report-mails/:mailId/retry',
    access: ['practitioner'],
    handler: r.reviewRetryMail,
  },
  { method: 'get', path: '/api/admin/mailbox/messages', access: ['admin'], handler: r.mailboxList },
  {
    method: 'get',
    path: '/api/admin/mailbox/messages/:messageId',
    access: ['admin'],
    handler: r.mailboxMessage,
  },
  {
    method: 'get',
    path: '/api/admin/mailbox/messages/:messageId/attachments/:index',
    access: ['admin'],
    handler: r.mailboxAttachment,
  },
  // The practice: team and invitations (admin; the invitee's link is public and signed).
  { method: 'get', path: '/api/team', access: ['admin'], handler: team.listTeam },
  { method: 'post', path: '/api/team/invitations', access: ['admin'], handler: team.invite },
  { method: 'delete', path: '/api/team/invitations/:id', access: ['admin'], handler: team.revokeInvitation },
  { method: 'patch', path: '/api/team/users/:id', access: ['admin'], handler: team.updateUser },
  { method: 'get', path: '/api/invitations/:token', access: 'public', handler: team.previewInvitation },
  {
    method: 'post',
    path: '/api/invitations/:token/accept',
    access: 'public',
    handler: team.acceptInvitation,
    limit: 'sign-in',
  },
  { method: 'get', path: '/api/admin/attention', access: ['admin'], handler: overview.attentionCounts },
  // Client records on the wide screen; export and erasure are the admin's alone.
  {
    method: 'get',
    path: '/api/client-records',
    access: ['practitioner', 'admin'],
    handler: clientsAdmin.clientTable,
  },
  {
    method: 'post',
    path: '/api/client-records',
    access: ['practitioner', 'admin'],
    handler: clientsAdmin.createClient,
  },
  {
    method: 'get',
    path: '/api/client-records/:id',
    access: ['practitioner', 'admin'],
    handler: clientsAdmin.clientRecord,
  },
  {
    method: 'patch',
    path: '/api/client-records/:id',
    access: ['practitioner', 'admin'],
    handler: clientsAdmin.updateClient,
  },
  {
    method: 'get',
    path: '/api/client-records/:id/export',
    access: ['admin'],
    handler: exportRoutes.exportZip,
  },
  { method: 'post', path: '/api/client-records/:id/erase', access: ['admin'], handler: clientsAdmin.erase },
  { method: 'get', path: '/api/consent-texts', access: anyRole, handler: consent.listConsentTexts },
  { method: 'post', path: '/api/consent-texts', access: ['admin'], handler: consent.publishConsentText },
  // Follow-ups: everyone sees who is due; only the admin starts a reminder run by hand.
  { method: 'get', path: '/api/follow-ups/due', access: anyRole, handler: followUps.followUpsDue },
  {
    method: 'post',
    path: '/api/follow-ups/reminders/run',
    access: ['admin'],
    handler: followUps.runReminders,
  },
  // Billing: the card is typed on the provider's page; the provider's webhook is public and signed.
  { method: 'get', path: '/api/billing/payments', access: ['admin'], handler: payments.listPayments },
  { method: 'post', path: '/api/billing/payments', access: ['admin'], handler: payments.createPayment },
  {
    method: 'post',
    path: '/api/billing/payments/:id/refund',
    access: ['admin'],
    handler: payments.refundPayment,
  },
  { method: 'post', path: '/webhooks/payments', access: 'public', handler: payments.paymentWebhook },
  { method: 'get', path: '/payments/complete', access: 'public', handler: payments.paymentReturnPage },
  // Audit log: read only; there is deliberately no route that changes or removes an event.
  { method: 'get', path: '/api/audit', access: ['admin'], handler: audit.auditLog },
  // Clinic settings: everyone reads the ranges (review shows them); the admin changes them.
  { method: 'get', path: '/api/settings', access: ['admin'], handler: settings.getSettings },
  { method: 'put', path: '/api/settings', access: ['admin'], handler: settings.saveSettings },
  { method: 'get', path: '/api/settings/ranges', access: anyRole, handler: settings.getRanges },
  { method: 'delete', path: '/api/settings/ranges', access: ['admin'], handler: settings.resetAllRanges },
  {
    method: 'put',
    path: '/api/settings/ranges/:metric/:site',
    access: ['admin'],
    handler: settings.setRange,
  },
  {
    method: 'delete',
    path: '/api/settings/ranges/:metric/:site',
    access: ['admin'],
    handler: settings.resetRange,
  },
];
