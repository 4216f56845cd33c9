import { z } from 'zod';
import { qualityVerdictSchema, sessionStatusSchema, siteSchema } from './clinic';
import { calendarDateSchema, instantSchema } from './dates';

// Bumped when a device and the server could misread each other; the server refuses other versions with 426.
export const SYNC_PROTOCOL_VERSION = 1;
export const SYNC_PROTOCOL_HEADER = 'x-fourpoint-protocol';

export const SYNC_PATHS = {
  push: '/api/sync/push',
  pull: '/api/sync/pull',
  uploads: '/api/sync/uploads',
  blob: (sha256: string) => `/api/sync/blobs/${sha256}`,
  clinicPublicKey: '/api/clinic/public-key',
} as const;

export const syncEntitySchema = z.enum(['clients', 'consents', 'recording_sessions', 'site_recordings']);
export type SyncEntity = z.infer<typeof syncEntitySchema>;
export const syncEntities: readonly SyncEntity[] = syncEntitySchema.options;

const text = (max: number) => z.string().max(max);

// The fields a device may write, per entity. Server-owned fields (analysis of record, clip state) are not here:
// a device that sends them is rejected, so they can only come from the server.
export const syncFieldSchemas = {
  clients: z.object({
    firstName: text(100).min(1),
    lastName: text(100).min(1),
    dateOfBirth: calendarDateSchema.nullable(),
    email: z.email().max(254).nullable(),
    phone: text(40).nullable(),
    notes: text(4000).nullable(),
  }),
  consents: z.object({
    clientId: z.uuid(),
    consentTextId: z.uuid(),
    consentTextVersion: z.number().int().positive(),
    typedName: text(200).min(1),
    consentDate: calendarDateSchema,
  }),
  recording_sessions: z.object({
    clientId: z.uuid(),
    status: sessionStatusSchema,
    startedAt: instantSchema,
    finishedAt: instantSchema.nullable(),
    findings: text(20000).nullable(),
    plan: text(20000).nullable(),
    followUpDate: calendarDateSchema.nullable(),
  }),
  site_recordings: z.object({
    sessionId: z.uuid(),
    site: siteSchema,
    qualityVerdict: qualityVerdictSchema.nullable(),
    clipSha256: z
      .string()
      .regex(/^[0-9a-f]{64}$/)
      .nullable(),
    durationS: z.number().nonnegative().max(600).nullable(),
    recordedAt: instantSchema.nullable(),
    skippedReason: text(500).nullable(),
    keepAnywayNote: text(1000).nullable(),
  }),
} as const satisfies Record<SyncEntity, z.ZodObject>;

// Fields the server fills; they travel down in pulls only.
export const serverOwnedFields = {
  clients: [],
  consents: ['recordedBy'],
  recording_sessions: ['operatorId', 'reviewedBy', 'reviewedAt'],
  site_recordings: ['analysis', 'clipState'],
} as const satisfies Record<SyncEntity, readonly string[]>;

export const rowDataSchema = z.record(z.string(), z.unknown());
export type RowData = z.infer<typeof rowDataSchema>;

/** Whether a device may write this field; an own key of the schema, so `constructor` or `toString` is not one. */
export const isDeviceField = (entity: SyncEntity, name: string): boolean =>
  Object.hasOwn(syncFieldSchemas[entity].shape, name);

// A change keeps every key the device sent: zod's record drops a `__proto__` key without a word, and the
// server refuses an unknown field by name instead of ignoring it.
const changeSchema = z.custom<RowData>(
  (value) =>
    typeof value === 'object' &&
    value !== null &&
    !Array.isArray(value) &&
    Object.getPrototypeOf(value) === Object.prototype,
  { error: 'A change is an object of field names and values.' },
);

/** A change is a partial set of fields; `deletedAt` set to a time is a delete (a tombstone the server keeps). */
export const mutationSchema = z.object({
  mutationId: z.uuid(),
  entity: syncEntitySchema,
  id: z.uuid(),
  /** 0 when the device creates the row. */
  baseVersion: z.number().int().nonnegative(),
  change: changeSchema,
});
export type Mutation = z.infer<typeof mutationSchema>;

export const pushRequestSchema = z.object({
  protocolVersion: z.number().int(),
  deviceId: z.uuid(),
  mutations: z.array(mutationSchema).min(1).max(200),
});
export type PushRequest = z.infer<typeof pushRequestSchema>;

export const rejectionCodeSchema = z.enum([
  'invalid_change',
  'unknown_row',
  'missing_parent',
  'forbidden',
  'server_error',
]);
export type RejectionCode = z.infer<typeof rejectionCodeSchema>;

export const mutationResultSchema = z.discriminatedUnion('status', [
  z.object({ mutationId: z.uuid(), status: z.literal('applied'), newVersion: z.number().int().positive() }),
  z.object({
    mutationId: z.uuid(),
    status: z.literal('already_applied'),
    /** What the first delivery answered; a replay changes nothing. */
    original: z.enum(['applied', 'conflict']),
    newVersion: z.number().int().positive().optional(),
    conflictId: z.uuid().optional(),
  }),
  z.object({
    mutationId: z.uuid(),
    status: z.literal('conflict'),
    conflictId: z.uuid(),
    serverVersion: z.number().int().nonnegative(),
  }),
  z.object({
    mutationId: z.uuid(),
    status: z.literal('rejected'),
    code: rejectionCodeSchema,
    reason: z.string(),
  }),
]);
export type MutationResult = z.infer<typeof mutationResultSchema>;

export const pushResponseSchema = z.object({ results: z.array(mutationResultSchema) });
export type PushResponse = z.infer<typeof pushResponseSchema>;

/** Checkpoints are the server's change sequence (a bigint), sent as a decimal string. */
export const checkpointSchema = z.string().regex(/^\d{1,19}$/);
export const INITIAL_CHECKPOINT = '0';

export const pullRequestSchema = z.object({
  protocolVersion: z.number().int(),
  deviceId: z.uuid(),
  checkpoint: checkpointSchema,
  limit: z.number().int().min(1).max(1000).default(200),
});
export type PullRequest = z.input<typeof pullRequestSchema>;

export const pulledRowSchema = z.object({
  entity: syncEntitySchema,
  id: z.uuid(),
  version: z.number().int().positive(),
  changeSeq: checkpointSchema,
  updatedAt: z.string(),
  deletedAt: z.string().nullable(),
  data: rowDataSchema,
});
export type PulledRow = z.infer<typeof pulledRowSchema>;

export const pullResponseSchema = z.object({
  rows: z.array(pulledRowSchema),
  nextCheckpoint: checkpointSchema,
  hasMore: z.boolean(),
});
export type PullResponse = z.infer<typeof pullResponseSchema>;

export const blobStatusResponseSchema = z.object({
  sha256: z.string(),
  state: z.enum(['missing', 'receiving', 'stored', 'failed']),
  failure: z.string().nullable(),
});
export type BlobStatusResponse = z.infer<typeof blobStatusResponseSchema>;

export const clinicPublicKeyResponseSchema = z.object({
  algorithm: z.literal('x25519'),
  /** 32 bytes, hex. */
  publicKey: z.string().regex(/^[0-9a-f]{64}$/),
});
export type ClinicPublicKeyResponse = z.infer<typeof clinicPublicKeyResponseSchema>;

// Kept in errors.ts, which the sign-in path loads without building every sync schema.
export { OUTDATED_CLIENT_MESSAGE } from './errors';

// Admin: conflicts.
export const conflictSideSchema = z.object({
  version: z.number().int().nonnegative(),
  data: rowDataSchema,
  deletedAt: z.string().nullable(),
});

export const conflictSummarySchema = z.object({
  id: z.uuid(),
  entity: syncEntitySchema,
  rowId: z.uuid(),
  status: z.enum(['open', 'resolved']),
  createdAt: z.string(),
  deviceId: z.string().nullable(),
  userName: z.string().nullable(),
  serverDeviceId: z.string().nullable(),
  serverUserName: z.string().nullable(),
  differingFields: z.array(z.string()),
  label: z.string(),
});
export type ConflictSummary = z.infer<typeof conflictSummarySchema>;

export const conflictListQuerySchema = z.object({
  status: z.enum(['open', 'resolved', 'all']).default('open'),
});
export const conflictListResponseSchema = z.object({ conflicts: z.array(conflictSummarySchema) });
export type ConflictListResponse = z.infer<typeof conflictListResponseSchema>;

export const conflictDetailSchema = conflictSummarySchema.extend({
  /** The row as it was on the server when the stale change arrived. */
  server: conflictSideSchema,
  /** The row as the device wanted it: the server's row with the device's change on top. */
  client: conflictSideSchema,
  /** The device's change alone, as it was pushed. */
  clientChange: rowDataSchema,
  /** The row on the server now (it may have moved on since). */
  current: conflictSideSchema.nullable(),
  resolution: z
    .object({
      note: z.string(),
      resolvedBy: z.string().nullable(),
      resolvedAt: z.string(),
      newVersion: z.number().int(),
      /** For each field that differed, whose side was kept. */
      kept: z.record(z.string(), z.enum(['server', 'client'])),
    })
    .nullable(),
});
export type ConflictDetail = z.infer<typeof conflictDetailSchema>;
export const conflictDetailResponseSchema = z.object({ conflict: conflictDetailSchema });

export const resolveConflictRequestSchema = z
  .object({
    /** keep the server's row, keep the device's row, or pick each differing field. */
    keep: z.enum(['server', 'client', 'fields']),
    /** With keep = 'fields': for every differing field, which side wins. */
    fields: z.record(z.string(), z.enum(['server', 'client'])).optional(),
    note: z.string().trim().min(1, { error: 'Write a short note on why.' }).max(2000),
  })
  .refine((r) => r.keep !== 'fields' || (r.fields && Object.keys(r.fields).length > 0), {
    error: 'Pick a side for each differing field.',
    path: ['fields'],
  });
export type ResolveConflictRequest = z.infer<typeof resolveConflictRequestSchema>;
export const resolveConflictResponseSchema = z.object({
  conflict: conflictDetailSchema,
  newVersion: z.number().int(),
});
export type ResolveConflictResponse = z.infer<typeof resolveConflictResponseSchema>;
