import type { Sequelize, Transaction } from 'sequelize';
import { execute, selectRows } from './sql';

// `refresh_tokens` and the sign-ins they belong to (`sign_in_sessions`, one row per sign-in).

export interface RefreshTokenRecord {
  id: string;
  userId: string;
  familyId: string;
  expiresAt: Date;
  revokedAt: Date | null;
}

export async function insertRefreshToken(
  sequelize: Sequelize,
  row: {
    id: string;
    userId: string;
    familyId: string;
    tokenHash: string;
    expiresAt: Date;
    createdIp: string | null;
  },
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO refresh_tokens (id, user_id, family_id, token_hash, expires_at, created_ip)
     VALUES (:id, :userId, :familyId, :tokenHash, :expiresAt, :createdIp)`,
    row,
    transaction,
  );
}

/** Looked up by its hash alone: the token is the credential, and its user fixes the clinic. */
export async function findRefreshTokenByHash(
  sequelize: Sequelize,
  tokenHash: string,
  transaction?: Transaction,
): Promise<RefreshTokenRecord | null> {
  const rows = await selectRows<RefreshTokenRecord>(
    sequelize,
    `SELECT id, user_id AS "userId", family_id AS "familyId", expires_at AS "expiresAt", revoked_at AS "revokedAt"
     FROM refresh_tokens WHERE token_hash = :tokenHash ${transaction ? 'FOR UPDATE' : ''}`,
    { tokenHash },
    transaction,
  );
  return rows[0] ?? null;
}

/** Revokes the token unless something else already did; true when this call revoked it. */
export async function revokeRefreshToken(
  sequelize: Sequelize,
  id: string,
  replacedBy: string | null,
  transaction?: Transaction,
): Promise<boolean> {
  const count = await execute(
    sequelize,
    `UPDATE refresh_tokens SET revoked_at = now(), replaced_by = :replacedBy, updated_at = now()
     WHERE id = :id AND revoked_at IS NULL`,
    { id, replacedBy },
    transaction,
  );
  return count === 1;
}

/** Revokes every token still open of one sign-in (`family_id`) or of one user (`user_id`). */
async function revokeOpenTokens(
  sequelize: Sequelize,
  column: 'family_id' | 'user_id',
  value: string,
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `UPDATE refresh_tokens SET revoked_at = now(), updated_at = now() WHERE ${column} = :value AND revoked_at IS NULL`,
    { value },
    transaction,
  );
}

/** A disabled user's sign-ins end now: refresh tokens are revoked (access tokens fail on the user row). */
export const revokeUserRefreshTokens = (sequelize: Sequelize, userId: string, transaction?: Transaction) =>
  revokeOpenTokens(sequelize, 'user_id', userId, transaction);

/** Ends every sign-in of the user, e.g. after a password reset: their sessions end and refresh tokens are revoked. */
export async function endEverySignInOfUser(
  sequelize: Sequelize,
  userId: string,
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `UPDATE sign_in_sessions SET ended_at = now() WHERE user_id = :userId AND ended_at IS NULL`,
    { userId },
    transaction,
  );
  await revokeUserRefreshTokens(sequelize, userId, transaction);
}

/** A sign-in: its id is the refresh-token family and the `sid` of every access token issued under it. */
export async function insertSignInSession(
  sequelize: Sequelize,
  row: { id: string; userId: string },
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO sign_in_sessions (id, user_id) VALUES (:id, :userId)`,
    row,
    transaction,
  );
}

export async function isSignInSessionEnded(
  sequelize: Sequelize,
  id: string,
  transaction?: Transaction,
): Promise<boolean> {
  const rows = await selectRows<{ ended: boolean }>(
    sequelize,
    `SELECT ended_at IS NOT NULL AS ended FROM sign_in_sessions WHERE id = :id`,
    { id },
    transaction,
  );
  return rows[0]?.ended ?? true;
}

/**
 * Ends a sign-in: its access tokens stop at the next request and its refresh tokens are revoked.
 * Answers the user id when this call ended it, null when it had already ended or does not exist.
 */
export async function endSignInSession(
  sequelize: Sequelize,
  id: string,
  transaction?: Transaction,
): Promise<string | null> {
  const rows = await selectRows<{ user_id: string }>(
    sequelize,
    `UPDATE sign_in_sessions SET ended_at = now() WHERE id = :id AND ended_at IS NULL RETURNING user_id`,
    { id },
    transaction,
  );
  await revokeOpenTokens(sequelize, 'family_id', id, transaction);
  return rows[0]?.user_id ?? null;
}
