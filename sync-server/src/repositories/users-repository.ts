import type { Sequelize, Transaction } from 'sequelize';
import type { Role, User as PublicUser } from '@/shared/protocol';
import { execute, selectRows } from './sql';

// The `users` table: sign-in lookups, the admin's team list and changes, and accounts made from invitations.

export interface UserRecord extends Omit<PublicUser, 'timeZone'> {
  disabled: boolean;
  passwordHash: string;
}

const USER_COLUMNS = `u.id, u.clinic_id AS "clinicId", u.email, u.name, u.role, u.disabled, u.password_hash AS "passwordHash"`;

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

/** The one lookup without a clinic: sign-in is how a caller's clinic becomes known. */
export async function findUserByEmailForSignIn(
  sequelize: Sequelize,
  email: string,
): Promise<UserRecord | null> {
  const rows = await selectRows<UserRecord>(
    sequelize,
    `SELECT ${USER_COLUMNS} FROM users u WHERE u.email = :email`,
    {
      email: normaliseEmail(email),
    },
  );
  return rows[0] ?? null;
}

/** A refresh token names its user but no clinic; the user row supplies it. */
export async function findUserForRefreshToken(
  sequelize: Sequelize,
  userId: string,
  transaction?: Transaction,
): Promise<UserRecord | null> {
  const rows = await selectRows<UserRecord>(
    sequelize,
    `SELECT ${USER_COLUMNS} FROM users u WHERE u.id = :userId`,
    { userId },
    transaction,
  );
  return rows[0] ?? null;
}

export async function findUserInClinic(
  sequelize: Sequelize,
  clinicId: string,
  userId: string,
): Promise<UserRecord | null> {
  const rows = await selectRows<UserRecord>(
    sequelize,
    `SELECT ${USER_COLUMNS} FROM users u WHERE u.id = :userId AND u.clinic_id = :clinicId`,
    { clinicId, userId },
  );
  return rows[0] ?? null;
}

/**
 * The user behind an access token, or null when the user is gone, in another clinic, or the sign-in the token
 * belongs to has ended (signed out). Runs on every authenticated request: one query on two primary keys.
 */
export async function findUserForAccessToken(
  sequelize: Sequelize,
  clinicId: string,
  userId: string,
  sessionId: string,
): Promise<UserRecord | null> {
  const rows = await selectRows<UserRecord>(
    sequelize,
    `SELECT ${USER_COLUMNS}
     FROM users u JOIN sign_in_sessions s ON s.id = :sessionId AND s.user_id = u.id AND s.ended_at IS NULL
     WHERE u.id = :userId AND u.clinic_id = :clinicId`,
    { clinicId, userId, sessionId },
  );
  return rows[0] ?? null;
}

/** Replaces the stored hash, e.g. a bcrypt hash upgraded to argon2id after a sign-in that proved the password. */
export async function setPasswordHash(
  sequelize: Sequelize,
  userId: string,
  passwordHash: string,
  transaction?: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `UPDATE users SET password_hash = :passwordHash, updated_at = now() WHERE id = :userId`,
    { userId, passwordHash },
    transaction,
  );
}

export interface NewUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  passwordHash: string;
  disabled?: boolean;
}

/**
 * Adds an account; an address that already signs in (in any clinic) is answered `email_in_use`, also when another
 * request took it a moment earlier. No error is raised, so the caller's transaction stays usable.
 */
export async function createUser(
  sequelize: Sequelize,
  clinicId: string,
  input: NewUser,
  transaction?: Transaction,
): Promise<{ kind: 'created' } | { kind: 'email_in_use' }> {
  const rows = await selectRows<{ id: string }>(
    sequelize,
    `INSERT INTO users (id, clinic_id, email, name, role, password_hash, disabled)
     VALUES (:id, :clinicId, :email, :name, :role, :passwordHash, :disabled)
     ON CONFLICT (email) DO NOTHING RETURNING id`,
    { ...input, clinicId, email: normaliseEmail(input.email), disabled: input.disabled ?? false },
    transaction,
  );
  return rows.length === 1 ? { kind: 'created' } : { kind: 'email_in_use' };
}

export const emailTaken = async (sequelize: Sequelize, email: string, transaction?: Transaction) =>
  (
    await selectRows(
      sequelize,
      `SELECT 1 FROM users WHERE email = :email`,
      { email: normaliseEmail(email) },
      transaction,
    )
  ).length > 0;

export type TeamUserRow = {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabled: boolean;
  created_at: Date;
};

export const listTeamUsers = (sequelize: Sequelize, clinicId: string) =>
  selectRows<TeamUserRow>(
    sequelize,
    `SELECT id, email, name, role, disabled, created_at FROM users WHERE clinic_id = :clinicId ORDER BY name, email`,
    { clinicId },
  );

/** Locks the clinic's admins, so two changes at once cannot both remove "the other" last admin. */
export const lockActiveAdmins = (sequelize: Sequelize, clinicId: string, transaction: Transaction) =>
  selectRows<{ id: string }>(
    sequelize,
    `SELECT id FROM users WHERE clinic_id = :clinicId AND role = 'admin' AND NOT disabled ORDER BY id FOR UPDATE`,
    { clinicId },
    transaction,
  );

/** One team member of the clinic, locked for the change the caller is about to make. */
export async function lockTeamUser(
  sequelize: Sequelize,
  clinicId: string,
  userId: string,
  transaction: Transaction,
): Promise<TeamUserRow | null> {
  const rows = await selectRows<TeamUserRow>(
    sequelize,
    `SELECT id, role, disabled, email, name, created_at FROM users WHERE id = :userId AND clinic_id = :clinicId FOR UPDATE`,
    { clinicId, userId },
    transaction,
  );
  return rows[0] ?? null;
}

export const updateTeamUser = (
  sequelize: Sequelize,
  clinicId: string,
  userId: string,
  change: { role: Role; disabled: boolean },
  transaction?: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE users SET role = :role, disabled = :disabled, updated_at = now()
     WHERE id = :userId AND clinic_id = :clinicId`,
    { clinicId, userId, ...change },
    transaction,
  );
