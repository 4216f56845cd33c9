import { randomUUID } from 'node:crypto';
import type { SignInRequest, User } from '@/shared/protocol';
import { AppError, unauthenticated } from '../errors';
import { recordAuditEvent } from '../repositories/audit-repository';
import {
  endSignInSession,
  findRefreshTokenByHash,
  insertRefreshToken,
  insertSignInSession,
  isSignInSessionEnded,
  revokeRefreshToken,
} from '../repositories/refresh-tokens-repository';
import {
  findUserByEmailForSignIn,
  findUserForRefreshToken,
  findUserInClinic,
  setPasswordHash,
  type UserRecord,
} from '../repositories/users-repository';
import { hashPassword, verifyPassword } from '../services/passwords';
import { hashRefreshToken, newRefreshToken, REFRESH_TOKEN_TTL_MS, signAccessToken } from '../services/tokens';
import type { Transaction } from 'sequelize';
import { clinicTimeZone } from './settings/settings';
import type { UseCaseDeps } from './context';

/** Tokens as the use cases issue them; the route decides whether the refresh token goes in a cookie. */
export interface IssuedTokens {
  accessToken: string;
  refreshToken: string;
  user: User;
}

// A wrong password, an unknown e-mail and a disabled account all get this one answer (OWASP ASVS 4.0.3
// V2.2.1 / V3.2: no account enumeration), after the same password verification.
const wrongCredentials = () =>
  new AppError('invalid_credentials', 'The e-mail or password is not right.', 401);
const refreshRefused = () =>
  new AppError('invalid_refresh_token', 'Your session has ended. Sign in again.', 401);
/** For a caller who already proved the password: their account was disabled since. */
export const accountDisabled = () =>
  new AppError('account_disabled', "This account is disabled. Ask your clinic's admin.", 401);

/** The user as the app sees it, with the zone its clinic writes dates in (kept on the device for offline use). */
export const toPublicUser = async (deps: Pick<UseCaseDeps, 'sequelize'>, u: UserRecord): Promise<User> => ({
  id: u.id,
  email: u.email,
  role: u.role,
  clinicId: u.clinicId,
  name: u.name,
  timeZone: await clinicTimeZone(deps, u.clinicId),
});

async function issueTokens(
  deps: UseCaseDeps,
  user: UserRecord,
  sessionId: string,
  ip: string | null,
  transaction?: Transaction,
): Promise<IssuedTokens & { refreshTokenId: string }> {
  const refreshToken = newRefreshToken();
  const refreshTokenId = randomUUID();
  await insertRefreshToken(
    deps.sequelize,
    {
      id: refreshTokenId,
      userId: user.id,
      familyId: sessionId,
      tokenHash: hashRefreshToken(refreshToken),
      expiresAt: new Date(Date.now() + REFRESH_TOKEN_TTL_MS),
      createdIp: ip,
    },
    transaction,
  );
  const accessToken = signAccessToken(
    { userId: user.id, role: user.role, clinicId: user.clinicId, sessionId },
    deps.jwtSecret,
  );
  return { accessToken, refreshToken, refreshTokenId, user: await toPublicUser(deps, user) };
}

export async function signIn(
  deps: UseCaseDeps,
  input: Pick<SignInRequest, 'email' | 'password'>,
  ip: string | null,
): Promise<IssuedTokens> {
  const user = await findUserByEmailForSignIn(deps.sequelize, input.email);
  const password = await verifyPassword(input.password, user?.passwordHash);
  if (!user || !password.ok || user.disabled) {
    // The account's admin sees failed sign-ins in its audit log; never the password tried, and nothing for an
    // address without an account (there is no clinic to tell).
    if (user)
      await recordAuditEvent({
        clinicId: user.clinicId,
        userId: user.id,
        action: 'auth.sign_in_failed',
        entity: 'user',
        entityId: user.id,
        ip,
        details: { reason: user.disabled ? 'account disabled' : 'wrong password' },
      });
    throw wrongCredentials();
  }
  // A hash from before argon2id (bcrypt) is replaced now that the password is known to be right.
  if (password.needsRehash)
    await setPasswordHash(deps.sequelize, user.id, await hashPassword(input.password));
  return deps.sequelize.transaction(async (transaction) => {
    const sessionId = randomUUID();
    await insertSignInSession(deps.sequelize, { id: sessionId, userId: user.id }, transaction);
    const { refreshTokenId: _id, ...tokens } = await issueTokens(deps, user, sessionId, ip, transaction);
    await recordAuditEvent(
      {
        clinicId: user.clinicId,
        userId: user.id,
        action: 'auth.sign_in',
        entity: 'user',
        entityId: user.id,
        ip,
      },
      transaction,
    );
    return tokens;
  });
}

/** Swaps a refresh token for a new pair; presenting an already-used token ends that whole sign-in. */
/**
 * A refresh token used again within this window of its rotation is a lost answer, not a theft: a page that
 * reloads or navigates while its refresh is in flight never stores the new cookie and sends the old one again.
 * It gets fresh tokens in the same sign-in; after the window, a reuse ends the sign-in (OWASP ASVS 4.0.3 V3.5,
 * refresh token rotation with a short reuse interval: common practice, no source).
 */
export const REUSE_GRACE_MS = 30_000;

export async function refreshSession(
  deps: UseCaseDeps,
  refreshToken: string,
  ip: string | null,
): Promise<IssuedTokens> {
  const outcome = await deps.sequelize.transaction(async (transaction) => {
    const stored = await findRefreshTokenByHash(deps.sequelize, hashRefreshToken(refreshToken), transaction);
    if (!stored) return { kind: 'unknown' as const };
    const lostAnswer = stored.revokedAt !== null && Date.now() - stored.revokedAt.getTime() < REUSE_GRACE_MS;
    if (stored.revokedAt && !lostAnswer) return { kind: 'reused' as const, sessionId: stored.familyId };
    if (stored.expiresAt.getTime() <= Date.now()) return { kind: 'unknown' as const };
    if (await isSignInSessionEnded(deps.sequelize, stored.familyId, transaction))
      return { kind: 'unknown' as const };
    const user = await findUserForRefreshToken(deps.sequelize, stored.userId, transaction);
    if (!user) return { kind: 'unknown' as const };
    if (user.disabled) return { kind: 'disabled' as const };
    const next = await issueTokens(deps, user, stored.familyId, ip, transaction);
    if (
      !lostAnswer &&
      !(await revokeRefreshToken(deps.sequelize, stored.id, next.refreshTokenId, transaction))
    )
      throw refreshRefused();
    const { refreshTokenId: _id, ...tokens } = next;
    return { kind: 'ok' as const, tokens };
  });
  switch (outcome.kind) {
    case 'ok':
      return outcome.tokens;
    case 'reused':
      // Outside the lookup transaction, so ending the sign-in stands even though the request is refused.
      await endSignInSession(deps.sequelize, outcome.sessionId);
      throw refreshRefused();
    case 'disabled':
      throw accountDisabled();
    default:
      throw refreshRefused();
  }
}

/**
 * Ends the sign-in a refresh token belongs to: its refresh tokens and its access tokens stop working.
 * Ending an unknown or already ended sign-in is not an error.
 */
export async function signOut(deps: UseCaseDeps, refreshToken: string, ip: string | null): Promise<void> {
  const stored = await findRefreshTokenByHash(deps.sequelize, hashRefreshToken(refreshToken));
  if (!stored) return;
  await deps.sequelize.transaction(async (transaction) => {
    const userId = await endSignInSession(deps.sequelize, stored.familyId, transaction);
    if (!userId) return;
    const owner = await findUserForRefreshToken(deps.sequelize, userId, transaction);
    await recordAuditEvent(
      {
        clinicId: owner?.clinicId ?? null,
        userId,
        action: 'auth.sign_out',
        entity: 'user',
        entityId: userId,
        ip,
      },
      transaction,
    );
  });
}

export async function getMe(deps: UseCaseDeps, clinicId: string, userId: string): Promise<User> {
  const user = await findUserInClinic(deps.sequelize, clinicId, userId);
  if (!user) throw unauthenticated();
  return toPublicUser(deps, user);
}
