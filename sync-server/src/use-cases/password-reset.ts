import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { z } from 'zod';
import type { PasswordResetPreview } from '@/shared/protocol';
import { AppError } from '../errors';
import { recordAuditEvent } from '../repositories/audit-repository';
import {
  findPasswordReset,
  insertPasswordReset,
  markPasswordResetUsed,
  type PasswordResetRow,
} from '../repositories/password-resets-repository';
import { endEverySignInOfUser } from '../repositories/refresh-tokens-repository';
import { findUserByEmailForSignIn, normaliseEmail, setPasswordHash } from '../repositories/users-repository';
import { assertAcceptablePassword } from '../services/password-policy';
import { hashPassword } from '../services/passwords';
import type { UseCaseDeps } from './context';

/** Short-lived: the link only has to last until the person reads the e-mail (OWASP ASVS 4.0.3 V2.3.1, V2.5.x). */
export const PASSWORD_RESET_TTL_MS = 30 * 60 * 1000;

export const PASSWORD_RESET_ANSWER =
  'If an account uses this address, we have sent it a link to choose a new password. The link works once, within 30 minutes.';

const invalidLink = () =>
  new AppError(
    'reset_link_invalid',
    'This link is not valid. Ask for a new one from “Forgot password?” on the sign-in page.',
    404,
  );
const usedLink = () =>
  new AppError(
    'reset_link_used',
    'This link has already been used. Sign in with your new password, or ask for a new link.',
    409,
  );
const expiredLink = () =>
  new AppError(
    'reset_link_expired',
    'This link has expired. Ask for a new one from “Forgot password?” on the sign-in page.',
    410,
  );

// `~` as in invitation links: a `.` would read as a file extension to the web server's app-route fallback.
const tokenSeparator = '~';
const linkSchema = z.object({ r: z.uuid(), e: z.number() });

// Signed over the address and the password hash of the moment: once the password changes, every earlier link
// of that account stops working, even one never used.
const signature = (payload: string, email: string, passwordHash: string, secret: string) =>
  createHmac('sha256', secret)
    .update(`password-reset.${payload}.${normaliseEmail(email)}.${passwordHash}`)
    .digest();

async function resetOfLink(
  deps: UseCaseDeps,
  token: string,
  transaction?: Transaction,
): Promise<PasswordResetRow> {
  const [payload, given, extra] = token.split(tokenSeparator);
  if (!payload || !given || extra !== undefined) throw invalidLink();
  let link: z.infer<typeof linkSchema>;
  try {
    link = linkSchema.parse(JSON.parse(Buffer.from(payload, 'base64url').toString('utf8')));
  } catch {
    throw invalidLink();
  }
  const found = await findPasswordReset(deps.sequelize, link.r, transaction);
  if (found.kind === 'not_found') throw invalidLink();
  const row = found.reset;
  if (row.disabled) throw invalidLink();
  if (row.used_at) throw usedLink();
  const expected = signature(payload, row.email, row.password_hash, deps.jwtSecret);
  const givenBytes = Buffer.from(given, 'base64url');
  if (givenBytes.length !== expected.length || !timingSafeEqual(givenBytes, expected)) throw invalidLink();
  if (Math.min(link.e, new Date(row.expires_at).getTime()) <= Date.now()) throw expiredLink();
  return row;
}

/**
 * Sends a reset link when an active account uses the address; answers the same either way. The mail goes out
 * after the answer, so the time taken says nothing about the address either.
 */
export async function requestPasswordReset(
  deps: UseCaseDeps,
  email: string,
  linkBase: string,
  ip: string | null,
): Promise<{ message: string }> {
  const user = await findUserByEmailForSignIn(deps.sequelize, email);
  if (user && !user.disabled) {
    const id = randomUUID();
    const expiresAt = new Date(Date.now() + PASSWORD_RESET_TTL_MS);
    await deps.sequelize.transaction(async (transaction) => {
      await insertPasswordReset(deps.sequelize, { id, userId: user.id, expiresAt }, transaction);
      await recordAuditEvent(
        {
          clinicId: user.clinicId,
          userId: user.id,
          action: 'auth.password_reset_requested',
          entity: 'user',
          entityId: user.id,
          ip,
        },
        transaction,
      );
    });
    const payload = Buffer.from(JSON.stringify({ r: id, e: expiresAt.getTime() })).toString('base64url');
    const token = `${payload}${tokenSeparator}${signature(payload, user.email, user.passwordHash, deps.jwtSecret).toString('base64url')}`;
    void deps.services.mail
      .send({
        clinicId: user.clinicId,
        to: user.email,
        subject: 'Choose a new Fourpoint password',
        text: [
          `Hello ${user.name},`,
          '',
          'Someone (we hope you) asked to choose a new password for your Fourpoint account.',
          'Open this link within 30 minutes to choose it; it works once:',
          `${linkBase}/reset-password/${token}`,
          '',
          'If you did not ask for this, ignore this e-mail: your password stays as it is.',
        ].join('\n'),
      })
      .catch(() => undefined);
  }
  return { message: PASSWORD_RESET_ANSWER };
}

export async function previewPasswordReset(deps: UseCaseDeps, token: string): Promise<PasswordResetPreview> {
  const row = await resetOfLink(deps, token);
  return { email: row.email, expiresAt: new Date(row.expires_at).toISOString() };
}

/** Sets the new password once, and ends every sign-in of the account: whoever knew the old one is out. */
export async function completePasswordReset(
  deps: UseCaseDeps,
  token: string,
  password: string,
  ip: string | null,
): Promise<{ message: string }> {
  // Checked before the password is judged, so a dead link says so instead of judging the password.
  const checked = await resetOfLink(deps, token);
  assertAcceptablePassword(password, checked.email);
  const passwordHash = await hashPassword(password);
  await deps.sequelize.transaction(async (transaction) => {
    const row = await resetOfLink(deps, token, transaction);
    // The row is locked by resetOfLink, so this is the one use; a second finds it used there.
    if ((await markPasswordResetUsed(deps.sequelize, row.id, transaction)).kind === 'already_used')
      throw usedLink();
    await setPasswordHash(deps.sequelize, row.user_id, passwordHash, transaction);
    await endEverySignInOfUser(deps.sequelize, row.user_id, transaction);
    await recordAuditEvent(
      {
        clinicId: row.clinic_id,
        userId: row.user_id,
        action: 'auth.password_reset',
        entity: 'user',
        entityId: row.user_id,
        ip,
      },
      transaction,
    );
  });
  return { message: 'Sign in with it now. Every earlier sign-in of this account has ended.' };
}
