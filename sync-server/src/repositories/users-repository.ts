import { QueryTypes, type Transaction } from 'sequelize';
import type { Role, TeamMember, User as PublicUser } from '@/shared/protocol';
import { User } from '../models';

export interface UserRecord extends Omit<PublicUser, 'timeZone'> {
  disabled: boolean;
  passwordHash: string;
}

const toRecord = (u: User): UserRecord => ({
  id: u.id,
  clinicId: u.clinicId,
  email: u.email,
  name: u.name,
  role: u.role,
  disabled: u.disabled,
  passwordHash: u.passwordHash,
});

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

/** The one lookup without a clinic: sign-in is how a caller's clinic becomes known. */
export async function findUserByEmailForSignIn(email: string): Promise<UserRecord | null> {
  const user = await User.findOne({ where: { email: normaliseEmail(email) } });
  return user ? toRecord(user) : null;
}

/** A refresh token names its user but no clinic; the user row supplies it. */
export async function findUserForRefreshToken(
  userId: string,
  transaction?: Transaction,
): Promise<UserRecord | null> {
  const user = await User.findByPk(userId, { transaction });
  return user ? toRecord(user) : null;
}

export async function findUserInClinic(
  clinicId: string,
  userId: string,
  transaction?: Transaction,
): Promise<UserRecord | null> {
  // Runs on every authenticated request: a plain row, without building a model instance.
  const user = await User.findOne({ where: { id: userId, clinicId }, transaction, raw: true });
  return user ? toRecord(user) : null;
}

/**
 * The user behind an access token, or null when the user is gone, in another clinic, or the sign-in the token
 * belongs to has ended (signed out). Runs on every authenticated request: one query on two primary keys.
 */
export async function findUserForAccessToken(
  clinicId: string,
  userId: string,
  sessionId: string,
): Promise<UserRecord | null> {
  const rows = await User.sequelize!.query<UserRecord>(
    `SELECT u.id, u.clinic_id AS "clinicId", u.email, u.name, u.role, u.disabled, u.password_hash AS "passwordHash"
     FROM users u JOIN sign_in_sessions s ON s.id = :sessionId AND s.user_id = u.id AND s.ended_at IS NULL
     WHERE u.id = :userId AND u.clinic_id = :clinicId`,
    { replacements: { clinicId, userId, sessionId }, type: QueryTypes.SELECT },
  );
  return rows[0] ?? null;
}

/** Replaces the stored hash, e.g. a bcrypt hash upgraded to argon2id after a sign-in that proved the password. */
export async function setPasswordHash(userId: string, passwordHash: string): Promise<void> {
  await User.update({ passwordHash }, { where: { id: userId } });
}

export async function listUsers(clinicId: string): Promise<TeamMember[]> {
  const users = await User.findAll({ where: { clinicId }, order: [['name', 'ASC']] });
  return users.map((u) => ({ id: u.id, email: u.email, name: u.name, role: u.role, disabled: u.disabled }));
}

export interface NewUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  passwordHash: string;
  disabled?: boolean;
}

export async function createUser(
  clinicId: string,
  input: NewUser,
  transaction?: Transaction,
): Promise<UserRecord> {
  const user = await User.create({ ...input, email: normaliseEmail(input.email), clinicId }, { transaction });
  return toRecord(user);
}

export async function setUserDisabled(clinicId: string, userId: string, disabled: boolean): Promise<boolean> {
  const [count] = await User.update({ disabled }, { where: { id: userId, clinicId } });
  return count === 1;
}
