import type { Sequelize, Transaction } from 'sequelize';
import { execute, selectRows } from './sql';

// The `password_resets` table: one row per reset link sent. A link arrives before anyone is signed in, so these
// take no clinic id: the row names its user, and the user row names the clinic.

/** A reset link's row with the account it is for, as the link check needs it. */
export type PasswordResetRow = {
  id: string;
  user_id: string;
  expires_at: Date;
  used_at: Date | null;
  email: string;
  password_hash: string;
  clinic_id: string;
  disabled: boolean;
};

export async function insertPasswordReset(
  sequelize: Sequelize,
  reset: { id: string; userId: string; expiresAt: Date },
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO password_resets (id, user_id, expires_at) VALUES (:id, :userId, :expiresAt)`,
    reset,
    transaction,
  );
}

/**
 * The reset with its account, or `not_found`. Inside a transaction the row is locked until it ends, so two uses of
 * one link at the same moment are taken one after the other.
 */
export async function findPasswordReset(
  sequelize: Sequelize,
  id: string,
  transaction?: Transaction,
): Promise<{ kind: 'found'; reset: PasswordResetRow } | { kind: 'not_found' }> {
  const [reset] = await selectRows<PasswordResetRow>(
    sequelize,
    `SELECT r.id, r.user_id, r.expires_at, r.used_at, u.email, u.password_hash, u.clinic_id, u.disabled
     FROM password_resets r JOIN users u ON u.id = r.user_id WHERE r.id = :id
     ${transaction ? 'FOR UPDATE OF r' : ''}`,
    { id },
    transaction,
  );
  return reset ? { kind: 'found', reset } : { kind: 'not_found' };
}

/** Marks the link used once: a second use finds it `already_used` and changes nothing. */
export async function markPasswordResetUsed(
  sequelize: Sequelize,
  id: string,
  transaction?: Transaction,
): Promise<{ kind: 'marked' } | { kind: 'already_used' }> {
  const changed = await execute(
    sequelize,
    `UPDATE password_resets SET used_at = now() WHERE id = :id AND used_at IS NULL`,
    { id },
    transaction,
  );
  return changed === 1 ? { kind: 'marked' } : { kind: 'already_used' };
}
