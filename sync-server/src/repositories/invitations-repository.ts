import type { Sequelize, Transaction } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { execute, selectRows } from './sql';

// The `invitations` table: the admin's invitations and the accounts made from them (users-repository).

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
