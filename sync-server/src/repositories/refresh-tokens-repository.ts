import { Op, QueryTypes, type Transaction } from 'sequelize';
import { RefreshToken } from '../models';

export interface RefreshTokenRecord {
  id: string;
  userId: string;
  familyId: string;
  expiresAt: Date;
  revokedAt: Date | null;
}

export async function insertRefreshToken(
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
  await RefreshToken.create(row, { transaction });
}

/** Looked up by its hash alone: the token is the credential, and its user fixes the clinic. */
export async function findRefreshTokenByHash(
  tokenHash: string,
  transaction?: Transaction,
): Promise<RefreshTokenRecord | null> {
  const row = await RefreshToken.findOne({
    where: { tokenHash },
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
  return row
    ? {
        id: row.id,
        userId: row.userId,
        familyId: row.familyId,
        expiresAt: row.expiresAt,
        revokedAt: row.revokedAt,
      }
    : null;
}

/** Revokes the token unless something else already did; true when this call revoked it. */
export async function revokeRefreshToken(
  id: string,
  replacedBy: string | null,
  transaction?: Transaction,
): Promise<boolean> {
  const [count] = await RefreshToken.update(
    { revokedAt: new Date(), replacedBy },
    { where: { id, revokedAt: { [Op.is]: null } }, transaction },
  );
  return count === 1;
}

export async function revokeRefreshTokenFamily(familyId: string, transaction?: Transaction): Promise<void> {
  await RefreshToken.update(
    { revokedAt: new Date() },
    { where: { familyId, revokedAt: { [Op.is]: null } }, transaction },
  );
}

/** A sign-in: its id is the refresh-token family and the `sid` of every access token issued under it. */
export async function insertSignInSession(
  row: { id: string; userId: string },
  transaction?: Transaction,
): Promise<void> {
  await RefreshToken.sequelize!.query(`INSERT INTO sign_in_sessions (id, user_id) VALUES (:id, :userId)`, {
    replacements: row,
    transaction,
  });
}

export async function isSignInSessionEnded(id: string, transaction?: Transaction): Promise<boolean> {
  const rows = await RefreshToken.sequelize!.query<{ ended: boolean }>(
    `SELECT ended_at IS NOT NULL AS ended FROM sign_in_sessions WHERE id = :id`,
    { replacements: { id }, type: QueryTypes.SELECT, transaction },
  );
  return rows[0]?.ended ?? true;
}

/**
 * Ends a sign-in: its access tokens stop at the next request and its refresh tokens are revoked.
 * Answers the user id when this call ended it, null when it had already ended or does not exist.
 */
export async function endSignInSession(id: string, transaction?: Transaction): Promise<string | null> {
  const rows = await RefreshToken.sequelize!.query<{ user_id: string }>(
    `UPDATE sign_in_sessions SET ended_at = now() WHERE id = :id AND ended_at IS NULL RETURNING user_id`,
    { replacements: { id }, type: QueryTypes.SELECT, transaction },
  );
  await revokeRefreshTokenFamily(id, transaction);
  return rows[0]?.user_id ?? null;
}
