import { createHash, createSecretKey, randomBytes, type KeyObject } from 'node:crypto';
import jwt from 'jsonwebtoken';
import { z } from 'zod';
import { roleSchema, type Role } from '@/shared/protocol';

export const ACCESS_TOKEN_TTL_S = 15 * 60;
export const REFRESH_TOKEN_TTL_MS = 30 * 24 * 60 * 60 * 1000;
const ISSUER = 'fourpoint';

export interface AccessClaims {
  userId: string;
  role: Role;
  clinicId: string;
  /** The sign-in (refresh-token family) the token was issued under; signing out ends it. */
  sessionId: string;
}

const payloadSchema = z.object({ sub: z.string(), role: roleSchema, clinicId: z.string(), sid: z.uuid() });

// Given a string, jsonwebtoken first tries it as a PEM public or private key, which throws and costs more than
// the HMAC itself, on every request; a secret KeyObject made once skips that.
const secretKeys = new Map<string, KeyObject>();
function hmacKey(secret: string): KeyObject {
  let key = secretKeys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret));
    secretKeys.set(secret, key);
  }
  return key;
}

export function signAccessToken(claims: AccessClaims, secret: string, ttlS = ACCESS_TOKEN_TTL_S): string {
  return jwt.sign({ role: claims.role, clinicId: claims.clinicId, sid: claims.sessionId }, hmacKey(secret), {
    subject: claims.userId,
    expiresIn: ttlS,
    issuer: ISSUER,
    algorithm: 'HS256',
  });
}

/** Returns the claims, or null for a token that is malformed, forged or expired. */
export function verifyAccessToken(token: string, secret: string): AccessClaims | null {
  try {
    const payload = payloadSchema.safeParse(
      jwt.verify(token, hmacKey(secret), { issuer: ISSUER, algorithms: ['HS256'] }),
    );
    if (!payload.success) return null;
    return {
      userId: payload.data.sub,
      role: payload.data.role,
      clinicId: payload.data.clinicId,
      sessionId: payload.data.sid,
    };
  } catch {
    return null;
  }
}

export const newRefreshToken = () => randomBytes(32).toString('base64url');
// Refresh tokens are 256 random bits, so a fast hash is enough; only the hash is stored.
export const hashRefreshToken = (token: string) => createHash('sha256').update(token).digest('hex');
