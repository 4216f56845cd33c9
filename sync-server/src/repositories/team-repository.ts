import type { Sequelize, Transaction } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { execute, selectRows } from './sql';

export type InvitationRow = {
  id: string;
  clinic_id: string;
  email: string;
  name: string;
  role: Role;
  expires_at: Date;
  accepted_at: Date | null;
  revoked_at: Date | null;
  created_at: Date;
};

export const listTeamUsers = (sequelize: Sequelize, clinicId: string) =>
  selectRows<{ id: string; email: string; name: string; role: Role; disabled: boolean; created_at: Date }>(
    sequelize,
    `SELECT id, email, name, role, disabled, created_at FROM users WHERE clinic_id = :clinicId ORDER BY name, email`,
    { clinicId },
  );

export const listInvitations = (sequelize: Sequelize, clinicId: string) =>
  selectRows<InvitationRow>(
    sequelize,
    `SELECT * FROM invitations WHERE clinic_id = :clinicId ORDER BY created_at DESC LIMIT 100`,
    { clinicId },
  );

export async function insertInvitation(
  sequelize: Sequelize,
  row: {
    id: string;
    clinicId: string;
    email: string;
    name: string;
    role: Role;
    invitedBy: string;
    expiresAt: Date;
  },
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO invitations (id, clinic_id, email, name, role, invited_by, expires_at)
     VALUES (:id, :clinicId, :email, :name, :role, :invitedBy, :expiresAt)`,
    row,
    transaction,
  );
}

export async function findInvitation(
  sequelize: Sequelize,
  id: string,
  transaction?: Transaction,
  lock = false,
) {
  const rows = await selectRows<InvitationRow & { clinic_name: string }>(
    sequelize,
    `SELECT i.*, c.name AS clinic_name FROM invitations i JOIN clinics c ON c.id = i.clinic_id WHERE i.id = :id
     ${lock ? 'FOR UPDATE OF i' : ''}`,
    { id },
    transaction,
  );
  return rows[0] ?? null;
}

export const markInvitationAccepted = (
  sequelize: Sequelize,
  id: string,
  userId: string,
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE invitations SET accepted_at = now(), accepted_user_id = :userId, updated_at = now()
     WHERE id = :id AND accepted_at IS NULL AND revoked_at IS NULL`,
    { id, userId },
    transaction,
  );

export const revokeInvitation = (sequelize: Sequelize, clinicId: string, id: string) =>
  execute(
    sequelize,
    `UPDATE invitations SET revoked_at = now(), updated_at = now()
     WHERE id = :id AND clinic_id = :clinicId AND accepted_at IS NULL AND revoked_at IS NULL`,
    { id, clinicId },
  );

export const emailTaken = async (sequelize: Sequelize, email: string, transaction?: Transaction) =>
  (await selectRows(sequelize, `SELECT 1 FROM users WHERE email = :email`, { email }, transaction)).length >
  0;

/** Locks the clinic's admins, so two changes at once cannot both remove "the other" last admin. */
export const lockActiveAdmins = (sequelize: Sequelize, clinicId: string, transaction: Transaction) =>
  selectRows<{ id: string }>(
    sequelize,
    `SELECT id FROM users WHERE clinic_id = :clinicId AND role = 'admin' AND NOT disabled ORDER BY id FOR UPDATE`,
    { clinicId },
    transaction,
  );

export async function findTeamUser(
  sequelize: Sequelize,
  clinicId: string,
  userId: string,
  transaction?: Transaction,
) {
  const rows = await selectRows<{
    id: string;
    role: Role;
    disabled: boolean;
    email: string;
    name: string;
    created_at: Date;
  }>(
    sequelize,
    `SELECT id, role, disabled, email, name, created_at FROM users WHERE id = :userId AND clinic_id = :clinicId FOR UPDATE`,
    { clinicId, userId },
    transaction,
  );
  return rows[0] ?? null;
}

export const updateTeamUser = (
  sequelize: Sequelize,
  userId: string,
  change: { role: Role; disabled: boolean },
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE users SET role = :role, disabled = :disabled, updated_at = now() WHERE id = :userId`,
    { userId, ...change },
    transaction,
  );

/** A disabled user's sign-ins end now: refresh tokens are revoked (access tokens fail on the user row). */
export const revokeUserRefreshTokens = (sequelize: Sequelize, userId: string, transaction: Transaction) =>
  execute(
    sequelize,
    `UPDATE refresh_tokens SET revoked_at = now(), updated_at = now() WHERE user_id = :userId AND revoked_at IS NULL`,
    { userId },
    transaction,
  );
