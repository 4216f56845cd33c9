import { z } from 'zod';
import { qualityVerdictSchema, sessionStatusSchema, siteSchema, siteVerdictSchema } from './clinic';
import { murmurScreenSchema } from './analysis';
import { calendarDateSchema } from './dates';

const boolParam = z.enum(['true', 'false']).transform((v) => v === 'true');

export const reviewSortSchema = z.enum(['startedAt', 'clientName', 'operatorName', 'status']);
export type ReviewSort = z.infer<typeof reviewSortSchema>;

export const reviewSessionQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(100).default(25),
  cursor: z.string().max(500).optional(),
  sort: reviewSortSchema.default('startedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  clientId: z.uuid().optional(),
  operatorId: z.uuid().optional(),
  from: calendarDateSchema.optional(),
  to: calendarDateSchema.optional(),
  status: sessionStatusSchema.optional(),
  flagged: boolParam.optional(),
  quality: qualityVerdictSchema.optional(),
  q: z.string().trim().max(100).optional(),
});
export type ReviewSessionQuery = z.input<typeof reviewSessionQuerySchema>;

export const reviewSessionRowSchema = z.object({
  id: z.uuid(),
  clientId: z.uuid(),
  clientName: z.string(),
  operatorId: z.uuid().nullable(),
  operatorName: z.string().nullable(),
  status: sessionStatusSchema,
  startedAt: z.string(),
  followUpDate: z.string().nullable(),
  worstQuality: qualityVerdictSchema.nullable(),
  flagged: z.boolean(),
  sites: z.array(siteVerdictSchema),
});
export type ReviewSessionRow = z.infer<typeof reviewSessionRowSchema>;

export const reviewSessionPageSchema = z.object({
  sessions: z.array(reviewSessionRowSchema),
  nextCursor: z.string().nullable(),
  total: z.number().int().nonnegative(),
});
export type ReviewSessionPage = z.infer<typeof reviewSessionPageSchema>;

export const measurementStatusSchema = z.enum(['in_range', 'below', 'above', 'no_range', 'no_value']);
export type MeasurementStatus = z.infer<typeof measurementStatusSchema>;

export const measurementSchema = z.object({
  key: z.string(),
  label: z.string(),
  unit: z.string(),
  value: z.number().nullable(),
  range: z.object({ low: z.number().nullable(), high: z.number().nullable(), source: z.string() }).nullable(),
  status: measurementStatusSchema,
  /** The reading in words; anything outside range says "refer to a licensed clinician". */
  reading: z.string(),
});
export type Measurement = z.infer<typeof measurementSchema>;

/**
 * The analysis's murmur screen of one site (`analysis.screen`, the analysis schema's own); analyses made before
 * the screen existed have none, and read as null.
 */
export { murmurScreenSchema };
export type MurmurScreen = z.infer<typeof murmurScreenSchema>;

export const soundMarkSchema = z.object({ type: z.enum(['S1', 'S2']), startS: z.number(), endS: z.number() });
export type SoundMark = z.infer<typeof soundMarkSchema>;

export const reviewSiteSchema = z.object({
  site: siteSchema,
  recordingId: z.uuid().nullable(),
  qualityVerdict: qualityVerdictSchema.nullable(),
  qualityReasons: z.array(z.string()),
  clipState: z.string(),
  hasAudio: z.boolean(),
  durationS: z.number().nullable(),
  skippedReason: z.string().nullable(),
  heartRateBpm: z.number().nullable(),
  irregularRhythm: z.boolean(),
  sounds: z.array(soundMarkSchema),
  measurements: z.array(measurementSchema),
  murmurScreen: murmurScreenSchema.nullable(),
  referral: z.boolean(),
  /** Why this site flags the session, in words; empty when it does not. */
  referralReasons: z.array(z.string()),
});
export type ReviewSite = z.infer<typeof reviewSiteSchema>;

export const reviewNotesSchema = z.object({
  findings: z.string().nullable(),
  plan: z.string().nullable(),
  followUpDate: z.string().nullable(),
  version: z.number().int(),
  reviewedBy: z.string().nullable(),
  reviewedAt: z.string().nullable(),
});
export type ReviewNotes = z.infer<typeof reviewNotesSchema>;

/** A practitioner's own referral flag on a session, with the note they wrote. */
export const manualReferralFlagSchema = z.object({
  note: z.string(),
  flaggedBy: z.string().nullable(),
  flaggedAt: z.string(),
});
export type ManualReferralFlag = z.infer<typeof manualReferralFlagSchema>;

/**
 * Whether the session is flagged for referral and why: any site's referral reasons (a measure the clinic's ranges
 * mark "refer", an irregular rhythm, a possible murmur) or the practitioner's own flag. The list filter, the session
 * view, the report and the e-mail all read this one answer.
 */
export const sessionReferralSchema = z.object({
  flagged: z.boolean(),
  reasons: z.array(z.string()),
  manual: manualReferralFlagSchema.nullable(),
});
export type SessionReferral = z.infer<typeof sessionReferralSchema>;

export const setReferralFlagRequestSchema = z.object({
  flagged: z.boolean(),
  note: z
    .string()
    .trim()
    .min(1, { error: 'Write a short note saying why.' })
    .max(2000, { error: 'At most 2 000 characters.' }),
});
export type SetReferralFlagRequest = z.infer<typeof setReferralFlagRequestSchema>;

export const reviewSessionDetailSchema = z.object({
  id: z.uuid(),
  clinicName: z.string(),
  client: z.object({
    id: z.uuid(),
    firstName: z.string(),
    lastName: z.string(),
    dateOfBirth: z.string().nullable(),
    email: z.string().nullable(),
  }),
  operatorName: z.string().nullable(),
  status: sessionStatusSchema,
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  notes: reviewNotesSchema,
  sites: z.array(reviewSiteSchema),
  flagged: z.boolean(),
  referral: sessionReferralSchema,
});
export type ReviewSessionDetail = z.infer<typeof reviewSessionDetailSchema>;

export const traceSchema = z.object({
  site: siteSchema,
  durationS: z.number(),
  /** Pairs of min and max per bucket, evenly spaced; values in -1..1. */
  bucketsPerSecond: z.number(),
  min: z.array(z.number()),
  max: z.array(z.number()),
  sounds: z.array(soundMarkSchema),
});
export type Trace = z.infer<typeof traceSchema>;

export const earlierVisitSchema = z.object({
  id: z.uuid(),
  startedAt: z.string(),
  status: sessionStatusSchema,
  worstQuality: qualityVerdictSchema.nullable(),
});
export const earlierVisitsSchema = z.object({ visits: z.array(earlierVisitSchema) });
export type EarlierVisit = z.infer<typeof earlierVisitSchema>;

export const comparisonRowSchema = z.object({
  site: siteSchema,
  key: z.string(),
  label: z.string(),
  unit: z.string(),
  then: z.number().nullable(),
  now: z.number().nullable(),
  change: z.number().nullable(),
});
export type ComparisonRow = z.infer<typeof comparisonRowSchema>;

export const comparisonSchema = z.object({
  now: z.object({ id: z.uuid(), startedAt: z.string() }),
  then: z.object({ id: z.uuid(), startedAt: z.string() }),
  rows: z.array(comparisonRowSchema),
  /** First S1 onset per site in each visit, so traces can be laid over each other aligned on S1. */
  firstS1: z.array(z.object({ site: siteSchema, now: z.number().nullable(), then: z.number().nullable() })),
});
export type Comparison = z.infer<typeof comparisonSchema>;

export const trendSeriesSchema = z.object({
  site: siteSchema,
  key: z.string(),
  label: z.string(),
  unit: z.string(),
  range: z.object({ low: z.number().nullable(), high: z.number().nullable(), source: z.string() }).nullable(),
  points: z.array(
    z.object({
      sessionId: z.uuid(),
      startedAt: z.string(),
      value: z.number().nullable(),
      status: measurementStatusSchema,
    }),
  ),
});
/** One visit's murmur screen at one site; null where that visit's analysis had no screen. */
export const trendMurmurSchema = z.object({
  sessionId: z.uuid(),
  startedAt: z.string(),
  site: siteSchema,
  screen: murmurScreenSchema.nullable(),
});
export type TrendMurmur = z.infer<typeof trendMurmurSchema>;
export const trendsSchema = z.object({
  client: z.object({ id: z.uuid(), firstName: z.string(), lastName: z.string() }),
  series: z.array(trendSeriesSchema),
  /** Every visit's murmur screen per site, oldest visit first (a recorded site only). */
  murmurScreens: z.array(trendMurmurSchema),
});
export type TrendSeries = z.infer<typeof trendSeriesSchema>;
export type Trends = z.infer<typeof trendsSchema>;

const notesText = z.string().max(20000, { error: 'At most 20 000 characters.' });
export const saveNotesRequestSchema = z.object({
  findings: notesText.nullable(),
  plan: notesText.nullable(),
  followUpDate: calendarDateSchema.nullable(),
  baseVersion: z.number().int().positive(),
});
export type SaveNotesRequest = z.infer<typeof saveNotesRequestSchema>;
export const staleNotesDetailsSchema = z.object({
  current: reviewNotesSchema,
  yours: saveNotesRequestSchema,
});
export type StaleNotesDetails = z.infer<typeof staleNotesDetailsSchema>;

export const reportMailStateSchema = z.enum(['queued', 'sending', 'sent', 'failed']);
export type ReportMailState = z.infer<typeof reportMailStateSchema>;
export const reportMailSchema = z.object({
  id: z.uuid(),
  sessionId: z.uuid(),
  to: z.string(),
  subject: z.string(),
  state: reportMailStateSchema,
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  /** When the server tries a failed send again by itself; null when it waits for a person. */
  nextAttemptAt: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
});
export type ReportMail = z.infer<typeof reportMailSchema>;
export const reportMailResponseSchema = z.object({ mail: reportMailSchema });
export const reportMailListSchema = z.object({ mails: z.array(reportMailSchema) });
export const sendReportRequestSchema = z.object({
  compareWith: z.uuid().nullable().optional(),
  to: z.email({ error: 'Enter a valid e-mail address.' }).max(254).optional(),
});
export type SendReportRequest = z.infer<typeof sendReportRequestSchema>;
export const reportQuerySchema = z.object({ compareWith: z.uuid().optional() });

export const mailboxMessageSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  attachments: z.array(
    z.object({
      index: z.number(),
      filename: z.string().nullable(),
      contentType: z.string(),
      size: z.number(),
    }),
  ),
});
export const mailboxListSchema = z.object({ messages: z.array(mailboxMessageSchema) });
export const mailboxMessageDetailSchema = mailboxMessageSchema.extend({
  text: z.string().nullable(),
  html: z.string().nullable(),
});
export type MailboxMessage = z.infer<typeof mailboxMessageSchema>;
export type MailboxMessageDetail = z.infer<typeof mailboxMessageDetailSchema>;
