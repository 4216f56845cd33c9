// Messages of the practice's side: team and invitations, client records, consent texts, follow-ups, billing,
// audit, export and erasure, clinic settings.
import { z } from 'zod';
import { roleSchema, userSchema } from './auth';
import { siteSchema } from './clinic';
import { calendarDateSchema } from './dates';
import { newPasswordSchema } from './password';
import { isTimeZone } from '../format/dates';

const trimmed = (max: number, label: string) =>
  z
    .string()
    .trim()
    .min(1, { error: `${label} is required.` })
    .max(max, { error: `${label} is at most ${max} characters.` });
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, { error: `At most ${max} characters.` })
    .transform((v) => (v === '' ? null : v))
    .nullable()
    .optional();

export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export const pageInfoSchema = z.object({ page: z.number(), pageSize: z.number(), total: z.number() });
export type PageInfo = z.infer<typeof pageInfoSchema>;

// Team and invitations
export const teamUserSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  disabled: z.boolean(),
  createdAt: z.string(),
});
export type TeamUser = z.infer<typeof teamUserSchema>;
export const invitationStatusSchema = z.enum(['pending', 'accepted', 'expired', 'revoked']);
export type InvitationStatus = z.infer<typeof invitationStatusSchema>;
export const invitationSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  status: invitationStatusSchema,
  expiresAt: z.string(),
  createdAt: z.string(),
});
export type Invitation = z.infer<typeof invitationSchema>;
export const teamResponseSchema = z.object({
  users: z.array(teamUserSchema),
  invitations: z.array(invitationSchema),
});
export type TeamResponse = z.infer<typeof teamResponseSchema>;

export const inviteRequestSchema = z.object({
  email: z.email({ error: 'Enter a valid e-mail address.' }).max(254),
  name: trimmed(120, 'Name'),
  role: roleSchema,
});
export type InviteRequest = z.infer<typeof inviteRequestSchema>;

export const updateTeamUserRequestSchema = z
  .object({ role: roleSchema.optional(), disabled: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, {
    error: 'Change the role or the disabled flag.',
  });
export type UpdateTeamUserRequest = z.infer<typeof updateTeamUserRequestSchema>;

export const invitationPreviewSchema = z.object({
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  clinicName: z.string(),
  expiresAt: z.string(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;
export const acceptInvitationRequestSchema = z.object({
  /** The address the invitation was sent to: a link joins only as the person it was sent to. */
  email: z.email({ error: 'Enter the e-mail address the invitation was sent to.' }).max(254),
  name: trimmed(120, 'Name'),
  password: newPasswordSchema,
});
export type AcceptInvitationRequest = z.infer<typeof acceptInvitationRequestSchema>;
/**
 * The account an accepted invitation made. No tokens: the new member signs in as usual, so no sign-in is
 * handed to a page outside the sign-in route (whose refresh token the web keeps in its httpOnly cookie).
 */
export const invitationAcceptedSchema = z.object({
  user: userSchema.pick({ id: true, email: true, name: true, role: true, clinicId: true }),
});
export type InvitationAccepted = z.infer<typeof invitationAcceptedSchema>;

// Client records
export const clientSortSchema = z.enum(['name', 'dateOfBirth', 'lastVisit', 'keepUntil', 'updatedAt']);
export const clientTableQuerySchema = pageQuerySchema.extend({
  q: z.string().trim().max(100).optional(),
  sort: clientSortSchema.default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  /** `due`: only clients whose records are past the clinic's retention period, for the admin to review. */
  retention: z.enum(['all', 'due']).default('all'),
});
export type ClientTableQuery = z.infer<typeof clientTableQuerySchema>;
/** What a caller may send: the defaulted fields are optional. */
export type ClientTableRequest = z.input<typeof clientTableQuerySchema>;
export const clientRowSchema = z.object({
  id: z.uuid(),
  firstName: z.string(),
  lastName: z.string(),
  dateOfBirth: z.string().nullable(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  lastVisit: z.string().nullable(),
  visits: z.number(),
  hasConsent: z.boolean(),
  nextFollowUp: z.string().nullable(),
  /** The last visit (or the day the client was added) plus the clinic's retention period, as YYYY-MM-DD. */
  keepUntil: z.string(),
  /** keepUntil has passed: the records are due for the admin's review (export, erase, or keep with a reason). */
  retentionDue: z.boolean(),
});
export type ClientRow = z.infer<typeof clientRowSchema>;
export const clientTableResponseSchema = z.object({
  clients: z.array(clientRowSchema),
  pageInfo: pageInfoSchema,
});
export type ClientTableResponse = z.infer<typeof clientTableResponseSchema>;

export const clientDetailsSchema = z.object({
  firstName: trimmed(100, 'First name'),
  lastName: trimmed(100, 'Last name'),
  dateOfBirth: calendarDateSchema.nullable().optional(),
  email: z
    .email({ error: 'Enter a valid e-mail address.' })
    .max(254)
    .nullable()
    .optional()
    .or(z.literal('').transform(() => null)),
  phone: optionalText(40),
  notes: optionalText(4000),
});
export type ClientDetails = z.infer<typeof clientDetailsSchema>;
export const updateClientRequestSchema = clientDetailsSchema.extend({ version: z.number().int().min(1) });
export type UpdateClientRequest = z.infer<typeof updateClientRequestSchema>;

export const visitSchema = z.object({
  sessionId: z.uuid(),
  startedAt: z.string(),
  status: z.string(),
  operatorName: z.string().nullable(),
  followUpDate: z.string().nullable(),
  consentVersion: z.number().nullable(),
  sitesRecorded: z.number(),
  paidFromPackage: z.boolean(),
});
export const consentRecordSchema = z.object({
  id: z.uuid(),
  typedName: z.string(),
  consentDate: z.string(),
  textVersion: z.number(),
  textTitle: z.string(),
  recordedAt: z.string(),
});
export const visitPackageSchema = z.object({
  id: z.uuid(),
  description: z.string(),
  visitsTotal: z.number(),
  visitsUsed: z.number(),
  visitsLeft: z.number(),
  status: z.enum(['active', 'refunded']),
  createdAt: z.string(),
});
export type VisitPackage = z.infer<typeof visitPackageSchema>;
export const clientRecordSchema = z.object({
  client: clientRowSchema.extend({
    notes: z.string().nullable(),
    version: z.number(),
    createdAt: z.string(),
  }),
  visits: z.array(visitSchema),
  consents: z.array(consentRecordSchema),
  packages: z.array(visitPackageSchema),
});
export type ClientRecord = z.infer<typeof clientRecordSchema>;

export const eraseClientRequestSchema = z.object({
  confirmName: z.string().trim().min(1, { error: "Type the client's full name to confirm." }),
});
export const eraseClientResponseSchema = z.object({
  erasureId: z.uuid(),
  /** The name as it was, for the admin's confirmation; the server no longer has it. */
  clientName: z.string(),
  /** What was erased, counted the way a practice counts it. */
  erased: z.object({
    visits: z.number(),
    recordings: z.number(),
    consents: z.number(),
    reportEmails: z.number(),
  }),
  rowsTombstoned: z.number(),
  blobsDeleted: z.number(),
});
export type EraseClientResponse = z.infer<typeof eraseClientResponseSchema>;

// Consent texts
export const consentTextSchema = z.object({
  id: z.uuid(),
  version: z.number(),
  title: z.string(),
  body: z.string(),
  isCurrent: z.boolean(),
  publishedAt: z.string(),
});
export type ConsentText = z.infer<typeof consentTextSchema>;
export const consentTextListResponseSchema = z.object({ texts: z.array(consentTextSchema) });
export const publishConsentTextRequestSchema = z.object({
  title: trimmed(200, 'Title'),
  body: trimmed(20000, 'Text'),
});
export type PublishConsentTextRequest = z.infer<typeof publishConsentTextRequestSchema>;
export const publishConsentTextResponseSchema = z.object({ text: consentTextSchema });

// Follow-ups
export const followUpDueSchema = z.object({
  clientId: z.uuid(),
  clientName: z.string(),
  followUpDate: z.string(),
  daysUntil: z.number(),
  lastVisit: z.string(),
  reminderStatus: z.enum(['none', 'pending', 'sending', 'sent', 'failed']),
});
export type FollowUpDue = z.infer<typeof followUpDueSchema>;
export const followUpsDueResponseSchema = z.object({ due: z.array(followUpDueSchema) });
export type FollowUpsDueResponse = z.infer<typeof followUpsDueResponseSchema>;
export const followUpsDueQuerySchema = z.object({
  withinDays: z.coerce.number().int().min(0).max(365).default(14),
});
export const reminderRunResponseSchema = z.object({
  queued: z.number(),
  sent: z.number(),
  failed: z.number(),
});
export type ReminderRunResponse = z.infer<typeof reminderRunResponseSchema>;

// Billing
export const offerSchema = z.object({
  id: z
    .string()
    .trim()
    .regex(/^[a-z0-9-]{1,40}$/, { error: 'Use lower-case letters, digits and dashes for an offer id.' }),
  label: trimmed(120, 'Label'),
  visits: z.number().int().min(1).max(100),
  amountCents: z.number().int().min(50).max(10_000_000),
});
export type Offer = z.infer<typeof offerSchema>;
export const paymentStatusSchema = z.enum(['pending', 'paid', 'failed', 'refunded', 'expired']);
export type PaymentStatus = z.infer<typeof paymentStatusSchema>;
export const paymentSchema = z.object({
  id: z.uuid(),
  clientId: z.uuid().nullable(),
  clientName: z.string().nullable(),
  description: z.string(),
  visits: z.number(),
  amountCents: z.number(),
  currency: z.string(),
  status: paymentStatusSchema,
  checkoutUrl: z.string().nullable(),
  failureReason: z.string().nullable(),
  createdAt: z.string(),
  paidAt: z.string().nullable(),
  refundedAt: z.string().nullable(),
});
export type Payment = z.infer<typeof paymentSchema>;
export const paymentListQuerySchema = pageQuerySchema.extend({
  status: paymentStatusSchema.optional(),
  q: z.string().trim().max(100).optional(),
});
export const paymentListResponseSchema = z.object({
  payments: z.array(paymentSchema),
  pageInfo: pageInfoSchema,
  offers: z.array(offerSchema),
  currency: z.string(),
});
export type PaymentListResponse = z.infer<typeof paymentListResponseSchema>;
export const createPaymentRequestSchema = z.object({
  clientId: z.uuid({ error: 'Pick a client.' }),
  offerId: z.string().min(1, { error: 'Pick what is paid for.' }),
  sendEmail: z.boolean().default(true),
});
export type CreatePaymentRequest = z.input<typeof createPaymentRequestSchema>;
export const createPaymentResponseSchema = z.object({ payment: paymentSchema, emailed: z.boolean() });
export type CreatePaymentResponse = z.infer<typeof createPaymentResponseSchema>;

// Audit
export const auditQuerySchema = pageQuerySchema.extend({
  action: z.string().trim().max(80).optional(),
  userId: z.uuid().optional(),
  entity: z.string().trim().max(80).optional(),
  entityId: z.string().trim().max(80).optional(),
  /** Part of the name of the client the events concern. */
  client: z.string().trim().max(120).optional(),
  from: calendarDateSchema.optional(),
  to: calendarDateSchema.optional(),
});
export type AuditQuery = z.input<typeof auditQuerySchema>;
export const auditEventSchema = z.object({
  id: z.string(),
  occurredAt: z.string(),
  userId: z.string().nullable(),
  userName: z.string().nullable(),
  action: z.string(),
  entity: z.string().nullable(),
  entityId: z.string().nullable(),
  ip: z.string().nullable(),
  details: z.record(z.string(), z.unknown()).nullable(),
  /** The client the event concerns (directly, or through a visit, recording, consent or payment). */
  clientId: z.string().nullable(),
  /** Null when there is no client or the client was erased (the log never keeps an erased name). */
  clientName: z.string().nullable(),
  clientErased: z.boolean(),
  /** The team member or invitee a team or sign-in event is about. */
  subjectName: z.string().nullable(),
});
export type AuditEventRow = z.infer<typeof auditEventSchema>;
export const auditListResponseSchema = z.object({
  events: z.array(auditEventSchema),
  pageInfo: pageInfoSchema,
});
export type AuditListResponse = z.infer<typeof auditListResponseSchema>;

// Settings
/** An IANA zone name such as "Europe/Lisbon", as this runtime's Intl knows it. */
export const timeZoneSchema = z
  .string()
  .max(64)
  .refine(isTimeZone, { error: 'Choose a time zone from the list, such as Europe/Lisbon.' });
export const clinicSettingsSchema = z.object({
  name: trimmed(120, 'Clinic name'),
  address: optionalText(500),
  logoDataUrl: z
    .string()
    .max(400_000, { error: 'The logo is too large; use an image under 300 KB.' })
    .regex(/^data:image\/(png|jpeg);base64,[A-Za-z0-9+/=]+$/, {
      error: 'The logo must be a PNG or JPEG image.',
    })
    .nullable()
    .optional(),
  retentionMonths: z.number().int().min(1).max(600),
  reminderDaysBefore: z.number().int().min(0).max(60),
  currency: z.string().regex(/^[a-z]{3}$/, { error: 'Use a three-letter currency code such as usd.' }),
  offers: z.array(offerSchema).max(12),
  /** Older devices and saved forms send none: the clinic keeps its zone (see saveSettings). */
  timeZone: timeZoneSchema.optional(),
});
export type ClinicSettings = z.infer<typeof clinicSettingsSchema>;
export type ClinicSettingsInput = z.input<typeof clinicSettingsSchema>;

export const rangeSiteSchema = z.union([siteSchema, z.literal('all')]);
export const clinicRangeSchema = z.object({
  metric: z.string(),
  label: z.string(),
  unit: z.string(),
  site: rangeSiteSchema,
  low: z.number().nullable(),
  high: z.number().nullable(),
  defaultLow: z.number().nullable(),
  defaultHigh: z.number().nullable(),
  source: z.string(),
  overridden: z.boolean(),
});
export type ClinicRange = z.infer<typeof clinicRangeSchema>;
export const clinicRangesResponseSchema = z.object({ ranges: z.array(clinicRangeSchema) });
export type ClinicRangesResponse = z.infer<typeof clinicRangesResponseSchema>;
export const setRangeRequestSchema = z
  .object({ low: z.number().finite().nullable(), high: z.number().finite().nullable() })
  .refine((r) => r.low === null || r.high === null || r.low <= r.high, {
    error: 'The low end must not be above the high end.',
  });
export type SetRangeRequest = z.infer<typeof setRangeRequestSchema>;

// What needs the admin now, on the overview
export const attentionSchema = z.object({
  openConflicts: z.number().int(),
  /** Report e-mails the server will not try again by itself (refused, or out of attempts). */
  undeliveredReports: z.number().int(),
  clientsPastRetention: z.number().int(),
  /**
   * The server's own background tasks (reminders, report e-mail retries, the purge) that keep failing. Counted
   * over the whole server, not per clinic: it names no clinic's data, and every admin should know.
   */
  failingBackgroundTasks: z.number().int(),
});
export type Attention = z.infer<typeof attentionSchema>;
