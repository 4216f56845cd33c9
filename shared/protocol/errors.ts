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
