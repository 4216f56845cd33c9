import { randomUUID } from 'node:crypto';
import type { RefreshRequest, SignInRequest, SignInResponse, User } from '@/shared/protocol';
import { AppError, unauthenticated } from '../errors';
import { recordAuditEvent } from '../repositories/audit-repository';
import {
  findRefreshTokenByHash,
  insertRefreshToken,
  revokeRefreshToken,
  revokeRefreshTokenFamily,
} from '../repositories/refresh-tokens-repository';
import {
  findUserByEmailForSignIn,
  findUserForRefreshToken,
  findUserInClinic,
  type UserRecord,
} from '../repositories/users-repository';
import { verifyPassword } from '../services/passwords';
import { hashRefreshToken, newRefreshToken, REFRESH_TOKEN_TTL_MS, signAccessToken } from '../services/tokens';
import type { Transaction } from 'sequelize';
import type { UseCaseDeps } from './context';

const wrongCredentials = () =>
  new AppError('invalid_credentials', 'The e-mail or password is not right.', 401);
const refreshRefused = () =>
  new AppError('invalid_refresh_token', 'Your session has ended. Sign in again.', 401);
export const accountDisabled = () =>
  new AppError('account_disabled', "This account is disabled. Ask your clinic's admin.", 401);

export const toPublicUser = (u: UserRecord): User => ({
  id: u.id,
  email: u.email,
  role: u.role,
  clinicId: u.clinicId,
  name: u.name,
});

async function issueTokens(
  deps: UseCaseDeps,
  user: UserRecord,
  familyId: string,
  ip: string | null,
  transaction?: Transaction,
): Promise<SignInResponse & { refreshTokenId: string }> {
  const refreshToken = newRefreshToken();
  const refreshTokenId = randomUUID();
  await insertRefreshToken(
    {
      id: refreshTokenId,
      userId: user.id,
      familyId,
      tokenHash: hashRefreshToken(refreshToken),
      expiresAt: new Date(Date.now() + REFRESH_TOKEN_TTL_MS),
      createdIp: ip,
    },
    transaction,
  );
  const accessToken = signAccessToken(
    { userId: user.id, role: user.role, clinicId: user.clinicId },
    deps.jwtSecret,
  );
  return { accessToken, refreshToken, refreshTokenId, user: toPublicUser(user) };
}

export async function signIn(
  deps: UseCaseDeps,
  input: SignInRequest,
  ip: string | null,
): Promise<SignInResponse> {
  const user = await findUserByEmailForSignIn(input.email);
  const passwordOk = await verifyPassword(input.password, user?.passwordHash);
  if (!user || !passwordOk) throw wrongCredentials();
  if (user.disabled) throw accountDisabled();
  return deps.sequelize.transaction(async (transaction) => {
    const { refreshTokenId: _id, ...tokens } = await issueTokens(deps, user, randomUUID(), ip, transaction);
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
export async function refreshSession(
  deps: UseCaseDeps,
  input: RefreshRequest,
  ip: string | null,
): Promise<SignInResponse> {
  const outcome = await deps.sequelize.transaction(async (transaction) => {
    const stored = await findRefreshTokenByHash(hashRefreshToken(input.refreshToken), transaction);
    if (!stored) return { kind: 'unknown' as const };
    if (stored.revokedAt) return { kind: 'reused' as const, familyId: stored.familyId };
    if (stored.expiresAt.getTime() <= Date.now()) return { kind: 'unknown' as const };
    const user = await findUserForRefreshToken(stored.userId, transaction);
    if (!user) return { kind: 'unknown' as const };
    if (user.disabled) return { kind: 'disabled' as const };
    const next = await issueTokens(deps, user, stored.familyId, ip, transaction);
    if (!(await revokeRefreshToken(stored.id, next.refreshTokenId, transaction))) throw refreshRefused();
    const { refreshTokenId: _id, ...tokens } = next;
    return { kind: 'ok' as const, tokens };
  });
  switch (outcome.kind) {
    case 'ok':
      return outcome.tokens;
    case 'reused':
      // Outside the lookup transaction, so the revocation stands even though the request is refused.
      await revokeRefreshTokenFamily(outcome.familyId);
      throw refreshRefused();
    case 'disabled':
      throw accountDisabled();
    default:
      throw refreshRefused();
  }
}

export async function signOut(deps: UseCaseDeps, input: RefreshRequest, ip: string | null): Promise<void> {
  const stored = await findRefreshTokenByHash(hashRefreshToken(input.refreshToken));
  if (!stored) return;
  await deps.sequelize.transaction(async (transaction) => {
    if (await revokeRefreshToken(stored.id, null, transaction)) {
      const user = await findUserForRefreshToken(stored.userId, transaction);
      await recordAuditEvent(
        {
          clinicId: user?.clinicId ?? null,
          userId: stored.userId,
          action: 'auth.sign_out',
          entity: 'user',
          entityId: stored.userId,
          ip,
        },
        transaction,
      );
    }
  });
}

export async function getMe(clinicId: string, userId: string): Promise<User> {
  const user = await findUserInClinic(clinicId, userId);
  if (!user) throw unauthenticated();
  return toPublicUser(user);
}
