import { Op, type Transaction } from 'sequelize';
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
