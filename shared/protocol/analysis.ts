import { z } from 'zod';

// The analysis result as zod, so the server checks what it stores and what it reads back (a jsonb column is
// `unknown` until parsed). `shared/analysis/types.ts` stays the analysis code's own vocabulary; analysis.test.ts
// proves at the type level that the two say the same thing, so neither can drift alone.

export const siteCodeSchema = z.enum(['mitral', 'tricuspid', 'aortic', 'pulmonic']);

export const heartSoundSchema = z.object({
  type: z.enum(['S1', 'S2']),
  startS: z.number(),
  endS: z.number(),
  peakAmplitude: z.number(),
});

export const qualityReasonSchema = z.enum([
  'too_short',
  'clipped',
  'too_noisy',
  'too_few_cycles',
  'no_heartbeat',
  'rate_out_of_range',
  'rate_unsure',
]);

export const qualitySchema = z.object({
  verdict: z.enum(['good', 'usable', 'retake']),
  reasons: z.array(z.object({ code: qualityReasonSchema, message: z.string() })),
  measures: z
    .object({
      periodicity: z.number().nullable(),
      clippedFraction: z.number(),
      restActivity: z.number().nullable(),
    })
    .optional(),
});

export const beatDetailSchema = z.object({
  s1StartS: z.number(),
  s1EndS: z.number(),
  s2StartS: z.number(),
  s2EndS: z.number(),
  nextS1StartS: z.number().nullable(),
  intervalMs: z.number().nullable(),
  systoleMs: z.number(),
  diastoleMs: z.number().nullable(),
  systolicActivity: z.number().nullable(),
  diastolicActivity: z.number().nullable(),
});

const measure = z.number().nullable();

export const metricsSchema = z.object({
  heartRateBpm: measure,
  sdnnMs: measure,
  rmssdMs: measure,
  pnn50: measure,
  irregularRhythm: z.boolean(),
  s1DurationMs: measure,
  s2DurationMs: measure,
  systoleMs: measure,
  diastoleMs: measure,
  systoleDiastoleRatio: measure,
  s1s2PeakRatio: measure,
  s1s2EnergyRatio: measure,
  systolicActivity: measure,
  diastolicActivity: measure,
  usableCycles: z.number(),
  beats: z.array(beatDetailSchema),
});

/**
 * The murmur screen of one site. `possible` is always shown as "possible murmur: refer to a licensed clinician",
 * never as a diagnosis; `unsure` means the clip was too poor to tell.
 */
export const murmurScreenSchema = z.object({
  murmur: z.enum(['possible', 'unlikely', 'unsure']),
  score: z.number(),
  reasons: z.array(z.string()),
});

/** What `analyseWav` returns (shared/analysis/types.ts `AnalysisResult`). */
export const analysisResultSchema = z.object({
  sampleRate: z.number(),
  durationS: z.number(),
  heartRateBpm: z.number().nullable(),
  sounds: z.array(heartSoundSchema),
  metrics: metricsSchema,
  quality: qualitySchema,
  screen: murmurScreenSchema,
  analysisVersion: z.string(),
});
export type AnalysisResultMessage = z.infer<typeof analysisResultSchema>;

/**
 * An analysis as the server keeps it (`site_recordings.analysis`, `clip_blobs.analysis`): the result, marked as
 * the server's when the server made it. Results stored before analysis 1.2 have no murmur screen.
 */
export const storedAnalysisSchema = analysisResultSchema.extend({
  source: z.literal('server').optional(),
  screen: murmurScreenSchema.optional(),
});
export type StoredAnalysis = z.infer<typeof storedAnalysisSchema>;

/** A clip that opened but that the analysis refused (too short, not a WAV…), with the reason in words. */
export const analysisFailureSchema = z.object({
  source: z.literal('server'),
  error: z.object({ code: z.string(), message: z.string() }),
});
export type AnalysisFailure = z.infer<typeof analysisFailureSchema>;

/** What the server's analysis of a clip stores: a result or the reason there is none. */
export const clipAnalysisSchema = z.union([storedAnalysisSchema, analysisFailureSchema]);
export type ClipAnalysis = z.infer<typeof clipAnalysisSchema>;

/**
 * A stored analysis read for lists and trends: the per-beat detail and the sound marks are left out by the
 * query (they are most of its size), so they are optional here.
 */
export const analysisSummarySchema = storedAnalysisSchema.extend({
  sounds: z.array(heartSoundSchema).optional(),
  metrics: metricsSchema.extend({ beats: z.array(beatDetailSchema).optional() }),
});
export type AnalysisSummary = z.infer<typeof analysisSummarySchema>;

/**
 * The band-passed trace of a clip for drawing, computed once when the clip is processed and kept beside it
 * (`clip_blobs.trace`): minimum and maximum per bucket, scaled to -1..1.
 */
export const storedTraceSchema = z.object({
  durationS: z.number().nonnegative(),
  bucketsPerSecond: z.number().positive(),
  min: z.array(z.number()),
  max: z.array(z.number()),
});
export type StoredTrace = z.infer<typeof storedTraceSchema>;
