import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { z } from 'zod';
import type {
  AcceptInvitationRequest,
  Invitation,
  InvitationAccepted,
  InvitationPreview,
  InviteRequest,
  TeamResponse,
  TeamUser,
  UpdateTeamUserRequest,
} from '@/shared/protocol/practice';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import { iso } from '../../repositories/sql';
import * as invitationRows from '../../repositories/invitations-repository';
import { revokeUserRefreshTokens } from '../../repositories/refresh-tokens-repository';
import * as userRows from '../../repositories/users-repository';
import { assertAcceptablePassword } from '../../services/password-policy';
import { hashPassword } from '../../services/passwords';
import type { Caller, UseCaseDeps } from '../context';

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

const invalidLink = () =>
  new AppError('invitation_invalid', 'This invitation link is not valid. Ask your admin for a new one.', 404);

const invitationUsed = () =>
  new AppError('invitation_used', 'This invitation has already been used. Sign in instead.', 409);
const emailInUse = () =>
  new AppError('email_in_use', 'Someone already signs in with this e-mail address.', 409);

// `~` joins the two parts: a `.` would read as a file extension, and the web server's fallback for app routes
// skips paths that look like files.
const tokenSeparator = '~';

type InvitationBinding = { id: string; clinicId: string; email: string; expiresAt: Date };

const signature = (payload: string, email: string, secret: string) =>
  createHmac('sha256', secret)
    .update(`invitation.${payload}.${userRows.normaliseEmail(email)}`)
    .digest();

/**
 * The link carries the invitation id, its clinic and its expiry; the signature also covers the invited address,
 * so a link works only for the very invitation row it was made for: its clinic, its address, its expiry.
 */
export function signInvitationToken(invitation: InvitationBinding, secret: string): string {
  const payload = Buffer.from(
    JSON.stringify({ i: invitation.id, c: invitation.clinicId, e: invitation.expiresAt.getTime() }),
  ).toString('base64url');
  return `${payload}${tokenSeparator}${signature(payload, invitation.email, secret).toString('base64url')}`;
}

const linkSchema = z.object({ i: z.uuid(), c: z.uuid(), e: z.number() });

/** The invitation row a link names, once its signature is checked against that row; anything else is invalid. */
async function invitationOfLink(
  deps: UseCaseDeps,
  token: string,
  transaction?: Transaction,
): Promise<{ row: invitationRows.InvitationRow & { clinic_name: string }; linkExpiry: number }> {
  const [payload, given, extra] = token.split(tokenSeparator);
  if (!payload || !given || extra !== undefined) throw invalidLink();
  let link: z.infer<typeof linkSchema>;
  try {
    link = linkSchema.parse(JSON.parse(Buffer.from(payload, 'base64url').toString('utf8')));
  } catch {
    throw invalidLink();
  }
  // The row lock makes a second, simultaneous use of the same link wait and then see it used.
  const row = await invitationRows.findInvitation(
    deps.sequelize,
    link.i,
    transaction,
    transaction !== undefined,
  );
  if (!row || row.clinic_id !== link.c) throw invalidLink();
  const expected = signature(payload, row.email, deps.jwtSecret);
  const givenBytes = Buffer.from(given, 'base64url');
  if (givenBytes.length !== expected.length || !timingSafeEqual(givenBytes, expected)) throw invalidLink();
  return { row, linkExpiry: link.e };
}

const invitationStatus = (row: invitationRows.InvitationRow): Invitation['status'] =>
  row.accepted_at
    ? 'accepted'
    : row.revoked_at
      ? 'revoked'
      : row.expires_at.getTime() <= Date.now()
        ? 'expired'
        : 'pending';

function checkUsable(row: invitationRows.InvitationRow, linkExpiry: number): void {
  if (row.accepted_at) throw invitationUsed();
  if (row.revoked_at)
    throw new AppError(
      'invitation_revoked',
      'This invitation was withdrawn. Ask your admin for a new one.',
      410,
    );
  if (Math.min(linkExpiry, row.expires_at.getTime()) <= Date.now()) {
    throw new AppError(
      'invitation_expired',
      'This invitation link has expired. Ask your admin to send a new one.',
      410,
    );
  }
}

export async function getTeam(deps: UseCaseDeps, caller: Caller): Promise<TeamResponse> {
  const [users, invitations] = await Promise.all([
    userRows.listTeamUsers(deps.sequelize, caller.clinicId),
    invitationRows.listInvitations(deps.sequelize, caller.clinicId),
  ]);
  return {
    users: users.map((u): TeamUser => ({
      id: u.id,
      email: u.email,
      name: u.name,
      role: u.role,
      disabled: u.disabled,
      createdAt: iso(u.created_at)!,
    })),
    invitations: invitations.map((i) => ({
      id: i.id,
      email: i.email,
      name: i.name,
      role: i.role,
      status: invitationStatus(i),
      expiresAt: iso(i.expires_at)!,
      createdAt: iso(i.created_at)!,
    })),
  };
}

export async function inviteUser(
  deps: UseCaseDeps,
  caller: Caller,
  input: InviteRequest,
  linkBase: string,
): Promise<{ invitation: Invitation; emailed: boolean }> {
  const email = userRows.normaliseEmail(input.email);
  if (await userRows.emailTaken(deps.sequelize, email)) throw emailInUse();
  const id = randomUUID();
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  await deps.sequelize.transaction(async (transaction) => {
    await invitationRows.insertInvitation(
      deps.sequelize,
      {
        id,
        clinicId: caller.clinicId,
        email,
        name: input.name,
        role: input.role,
        invitedBy: caller.userId,
        expiresAt,
      },
      transaction,
    );
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'team.invite',
        entity: 'invitation',
        entityId: id,
        ip: caller.ip,
        details: { role: input.role },
      },
      transaction,
    );
  });
  const row = (await invitationRows.findInvitation(deps.sequelize, id))!;
  const link = `${linkBase}/invite/${signInvitationToken(
    { id, clinicId: caller.clinicId, email, expiresAt },
    deps.jwtSecret,
  )}`;
  let emailed = true;
  try {
    await deps.services.mail.send({
      clinicId: caller.clinicId,
      to: email,
      subject: `You are invited to ${row.clinic_name} on Fourpoint`,
      text: [
        `Hello ${input.name},`,
        '',
        `You have been invited to join ${row.clinic_name} on Fourpoint as ${input.role}.`,
        `Open this link to set your password (it works once and expires on ${expiresAt.toUTCString()}):`,
        link,
        '',
        'If you did not expect this, ignore this e-mail.',
      ].join('\n'),
    });
  } catch {
    emailed = false;
  }
  return {
    emailed,
    invitation: {
      id,
      email,
      name: input.name,
      role: input.role,
      status: 'pending',
      expiresAt: expiresAt.toISOString(),
      createdAt: iso(row.created_at)!,
    },
  };
}

export async function previewInvitation(deps: UseCaseDeps, token: string): Promise<InvitationPreview> {
  const { row, linkExpiry } = await invitationOfLink(deps, token);
  checkUsable(row, linkExpiry);
  return {
    email: row.email,
    name: row.name,
    role: row.role,
    clinicName: row.clinic_name,
    expiresAt: iso(row.expires_at)!,
  };
}

/**
 * Makes the invited account, once: in the invitation's clinic, for the invitation's address and role, and only
 * while the invitation is open. Nothing the caller sends (a session of another clinic, another address) can
 * change where or as whom they join.
 */
export async function acceptInvitation(
  deps: UseCaseDeps,
  token: string,
  input: AcceptInvitationRequest,
  ip: string | null,
): Promise<InvitationAccepted> {
  // Checked before the password is judged, so a dead link says so instead of judging the password.
  const invited = await invitationOfLink(deps, token);
  checkUsable(invited.row, invited.linkExpiry);
  assertAcceptablePassword(input.password, invited.row.email);
  const passwordHash = await hashPassword(input.password);
  const user = await deps.sequelize.transaction(async (transaction) => {
    const { row, linkExpiry } = await invitationOfLink(deps, token, transaction);
    checkUsable(row, linkExpiry);
    if (userRows.normaliseEmail(input.email) !== row.email)
      throw new AppError(
        'invitation_other_address',
        'This invitation was sent to another e-mail address: use the address the invitation reached.',
        403,
      );
    if (await userRows.emailTaken(deps.sequelize, row.email, transaction)) throw emailInUse();
    const userId = randomUUID();
    const created = await userRows.createUser(
      deps.sequelize,
      row.clinic_id,
      { id: userId, email: row.email, name: input.name, role: row.role, passwordHash },
      transaction,
    );
    // Another clinic's invitation to the same address was accepted at the same moment.
    if (created.kind === 'email_in_use') throw emailInUse();
    if ((await invitationRows.markInvitationAccepted(deps.sequelize, row.id, userId, transaction)) !== 1)
      throw invitationUsed();
    await recordAuditEvent(
      {
        clinicId: row.clinic_id,
        userId,
        action: 'team.invitation_accepted',
        entity: 'invitation',
        entityId: row.id,
        ip,
        details: { role: row.role },
      },
      transaction,
    );
    return { id: userId, email: row.email, name: input.name, role: row.role, clinicId: row.clinic_id };
  });
  return { user };
}

export async function withdrawInvitation(
  deps: UseCaseDeps,
  caller: Caller,
  invitationId: string,
): Promise<void> {
  const changed = await invitationRows.revokeInvitation(deps.sequelize, caller.clinicId, invitationId);
  if (changed === 0) throw new AppError('not_found', 'There is no open invitation with this id.', 404);
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'team.invitation_revoked',
    entity: 'invitation',
    entityId: invitationId,
    ip: caller.ip,
  });
}

export async function changeTeamUser(
  deps: UseCaseDeps,
  caller: Caller,
  userId: string,
  input: UpdateTeamUserRequest,
): Promise<TeamUser> {
  return deps.sequelize.transaction(async (transaction) => {
    const admins = await userRows.lockActiveAdmins(deps.sequelize, caller.clinicId, transaction);
    const user = await userRows.lockTeamUser(deps.sequelize, caller.clinicId, userId, transaction);
    if (!user) throw new AppError('not_found', 'There is no such user in this clinic.', 404);
    const next = { role: input.role ?? user.role, disabled: input.disabled ?? user.disabled };
    const wasActiveAdmin = user.role === 'admin' && !user.disabled;
    const staysActiveAdmin = next.role === 'admin' && !next.disabled;
    if (wasActiveAdmin && !staysActiveAdmin && admins.length <= 1) {
      throw new AppError(
        'last_admin',
        'This is the clinic’s last active admin: make someone else an admin first.',
        409,
      );
    }
    await userRows.updateTeamUser(deps.sequelize, caller.clinicId, userId, next, transaction);
    if (next.disabled && !user.disabled) await revokeUserRefreshTokens(deps.sequelize, userId, transaction);
    const details: Record<string, unknown> = {};
    if (next.role !== user.role) details.role = { from: user.role, to: next.role };
    if (next.disabled !== user.disabled) details.disabled = next.disabled;
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'team.user_changed',
        entity: 'user',
        entityId: userId,
        ip: caller.ip,
        details,
      },
      transaction,
    );
    return {
      id: user.id,
      email: user.email,
      name: user.name,
      role: next.role,
      disabled: next.disabled,
      createdAt: iso(user.created_at)!,
    };
  });
}
