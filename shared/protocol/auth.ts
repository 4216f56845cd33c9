import { z } from 'zod';

export const roleSchema = z.enum(['operator', 'practitioner', 'admin']);
export type Role = z.infer<typeof roleSchema>;
export const roles: readonly Role[] = roleSchema.options;

export const userSchema = z.object({
  id: z.uuid(),
  email: z.email(),
  role: roleSchema,
  clinicId: z.uuid(),
  name: z.string(),
  /** The clinic's time zone (IANA); a session saved on a device before it existed reads as UTC. */
  timeZone: z.string().default('UTC'),
});
export type User = z.infer<typeof userSchema>;

/**
 * Where the server puts the refresh token. The web app asks for `cookie`: an httpOnly cookie scoped to /api/auth
 * that page scripts cannot read. Devices keep it in their own storage and take it in the body (the default).
 */
export const refreshTokenInSchema = z.enum(['body', 'cookie']);
export type RefreshTokenIn = z.infer<typeof refreshTokenInSchema>;

export const signInRequestSchema = z.object({
  email: z.email({ error: 'Enter a valid e-mail address.' }).max(254),
  password: z.string().min(1, { error: 'Enter your password.' }).max(200),
  refreshTokenIn: refreshTokenInSchema.optional(),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const signInResponseSchema = z.object({
  accessToken: z.string().min(1),
  /** Absent when it went into the refresh cookie instead. */
  refreshToken: z.string().min(1).optional(),
  user: userSchema,
});
export type SignInResponse = z.infer<typeof signInResponseSchema>;

/** The refresh token in the body (devices), or none when the web app's cookie carries it. */
export const refreshRequestSchema = z.object({
  refreshToken: z.string().min(1, { error: 'A refresh token is required.' }).max(500).optional(),
});
export type RefreshRequest = z.infer<typeof refreshRequestSchema>;

export const refreshResponseSchema = signInResponseSchema;
export type RefreshResponse = SignInResponse;

export const signOutRequestSchema = refreshRequestSchema;
export type SignOutRequest = RefreshRequest;

export const meResponseSchema = z.object({ user: userSchema });
export type MeResponse = z.infer<typeof meResponseSchema>;

export const passwordResetRequestSchema = z.object({
  email: z.email({ error: 'Enter a valid e-mail address.' }).max(254),
});
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>;

/** The same answer whether or not an account uses the address (OWASP ASVS 4.0.3 V2.5.x, no enumeration). */
export const passwordResetRequestedSchema = z.object({ message: z.string() });

export const passwordResetPreviewSchema = z.object({ email: z.email(), expiresAt: z.string() });
export type PasswordResetPreview = z.infer<typeof passwordResetPreviewSchema>;

export const completePasswordResetRequestSchema = z.object({
  password: z.string().min(1, { error: 'Enter a new password.' }).max(200),
});
export type CompletePasswordResetRequest = z.infer<typeof completePasswordResetRequestSchema>;
