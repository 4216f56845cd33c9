import { z } from 'zod';
import { roleSchema } from './auth';

export const siteSchema = z.enum(['mitral', 'tricuspid', 'aortic', 'pulmonic']);
export type Site = z.infer<typeof siteSchema>;

// Same words as shared/analysis Quality['verdict'].
export const qualityVerdictSchema = z.enum(['good', 'usable', 'retake']);
export type QualityVerdict = z.infer<typeof qualityVerdictSchema>;

export const sessionStatusSchema = z.enum(['in_progress', 'completed', 'reviewed', 'cancelled']);
export type SessionStatus = z.infer<typeof sessionStatusSchema>;

/** The newest consent the clinic holds for a client, so a device can record them without asking again. */
export const consentOnFileSchema = z.object({
  id: z.uuid(),
  signedName: z.string(),
  signedOn: z.string(),
  textVersion: z.number().int(),
  version: z.number().int(),
});
export type ConsentOnFile = z.infer<typeof consentOnFileSchema>;

export const clientSummarySchema = z.object({
  id: z.uuid(),
  firstName: z.string(),
  lastName: z.string(),
  dateOfBirth: z.string().nullable(),
  email: z.string().nullable(),
  hasConsent: z.boolean(),
  consent: consentOnFileSchema.nullable(),
  updatedAt: z.string(),
});
export type ClientSummary = z.infer<typeof clientSummarySchema>;

export const clientListQuerySchema = z.object({
  q: z.string().trim().max(100, { error: 'Search text is at most 100 characters.' }).optional(),
});
export const clientListResponseSchema = z.object({ clients: z.array(clientSummarySchema) });
export type ClientListResponse = z.infer<typeof clientListResponseSchema>;

export const siteVerdictSchema = z.object({
  site: siteSchema,
  verdict: qualityVerdictSchema.nullable(),
  skipped: z.boolean(),
});
export type SiteVerdict = z.infer<typeof siteVerdictSchema>;

export const sessionSummarySchema = z.object({
  id: z.uuid(),
  clientId: z.uuid(),
  clientName: z.string(),
  operatorName: z.string().nullable(),
  status: sessionStatusSchema,
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  followUpDate: z.string().nullable(),
  sites: z.array(siteVerdictSchema),
});
export type SessionSummary = z.infer<typeof sessionSummarySchema>;

export const sessionListResponseSchema = z.object({ sessions: z.array(sessionSummarySchema) });
export type SessionListResponse = z.infer<typeof sessionListResponseSchema>;

export const teamMemberSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  disabled: z.boolean(),
});
export type TeamMember = z.infer<typeof teamMemberSchema>;

// Where a site's clip is on its way to the server: none taken, waiting on the device, uploading, stored, failed.
export const clipStateSchema = z.enum(['none', 'pending', 'uploading', 'stored', 'failed']);
export type ClipState = z.infer<typeof clipStateSchema>;
