import { z } from 'zod';

// Every error the API sends has this shape; `code` is stable for programs, `message` is for people.
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

export const healthResponseSchema = z.object({ ok: z.boolean(), db: z.enum(['up', 'down']) });
export type HealthResponse = z.infer<typeof healthResponseSchema>;
/** Liveness: the process answers. Readiness: it can serve (database and blob storage reachable, not stopping). */
export const livenessResponseSchema = z.object({ ok: z.literal(true) });
export type LivenessResponse = z.infer<typeof livenessResponseSchema>;
export const readinessResponseSchema = z.object({
  ok: z.boolean(),
  db: z.enum(['up', 'down']),
  storage: z.enum(['up', 'down']),
  stopping: z.boolean(),
});
export type ReadinessResponse = z.infer<typeof readinessResponseSchema>;

/** The body of a 426 answer to a device too old to sync; the app shows `error.message`. */
export const OUTDATED_CLIENT_MESSAGE =
  'This version of Fourpoint is too old to sync with the clinic server. Update the app; nothing recorded on this device is lost.';
