import path from 'node:path';
import request from 'supertest';
import { signInvitationToken } from '@/sync-server/src/use-cases/team/team';
import { startPracticeFakes, linkIn, messagesTo, type PracticeFakes } from './helpers/practice-fakes';
import { makeClinic, makeTestContext, signIn, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let clinic: TestClinic;
let admin: string;

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  clinic = await makeClinic('Team');
  admin = (await tokensFor(ctx.app, clinic)).admin;
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

const unique = () => `${Math.random().toString(36).slice(2, 10)}@invitee.fourpoint.test`;

async function invite(email: string, role = 'practitioner') {
  const res = await request(ctx.app)
    .post('/api/team/invitations')
    .set('authorization', `Bearer ${admin}`)
    .send({ email, name: 'Rowan Vale', role });
  expect(res.status).toBe(201);
  const mail = messagesTo(fakes.mail, email).at(-1);
  expect(mail).toBeDefined();
  const link = linkIn(mail!.text, /http:\/\/127\.0\.0\.1:\d+\/invite\/[A-Za-z0-9_~-]+/);
  return { invitationId: res.body.invitation.id as string, token: link.split('/invite/')[1] };
}

describe('invitations', () => {
  test('when the admin invites someone, then the e-mail holds a link that shows the invitation and sets a password once', async () => {
    const email = unique();
    const { token } = await invite(email);
    const preview = await request(ctx.app).get(`/api/invitations/${token}`);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ email, role: 'practitioner', clinicName: clinic.name });

    const accepted = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Rowan Vale', password: 'a long enough password' });
    expect(accepted.status).toBe(201);
    expect(accepted.body.user).toMatchObject({ email, role: 'practitioner', clinicId: clinic.id });
    // No sign-in comes with it: a token in a page's reach is what the web's httpOnly cookie exists to avoid
    // (OWASP ASVS 4.0.3 V3.4.2); the new member signs in as usual.
    expect(Object.keys(accepted.body)).toEqual(['user']);
    expect(accepted.headers['set-cookie']).toBeUndefined();
    const again = await signIn(ctx.app, email, 'a long enough password');
    expect(again.user.role).toBe('practitioner');
  });

  test('when the invitee picks a common or e-mail-based password, then it is 400 with what to do and the link still works (ASVS V2.1.1, V2.1.7)', async () => {
    const email = unique();
    const { token } = await invite(email);
    const common = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Rowan Vale', password: 'password1234' });
    expect(common.status).toBe(400);
    expect(common.body.error).toMatchObject({
      code: 'weak_password',
      message: expect.stringMatching(/too easy to guess.*unrelated words/),
    });
    const withEmail = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Rowan Vale', password: `My ${email} pass` });
    expect(withEmail.status).toBe(400);
    expect(withEmail.body.error.message).toMatch(/Do not use your e-mail address/);
    const short = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Rowan Vale', password: 'Zq8#vLp2!mW' });
    expect(short.status).toBe(400);
    expect(short.body.error.message).toMatch(/at least 12 characters/);
    const accepted = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Rowan Vale', password: 'tidewater brass lantern' });
    expect(accepted.status).toBe(201);
  });

  test('when the admin invites someone, then the link path has no file extension, so the web app serves the page', async () => {
    const { token } = await invite(unique());
    // The server's fallback for app routes skips paths that look like files (an extension after a dot).
    expect(path.extname(`/invite/${token}`)).toBe('');
  });

  test('when the same invitation link is used twice, then the second use is refused and makes no second account', async () => {
    const email = unique();
    const { token } = await invite(email);
    const first = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'A', password: 'first password here' });
    expect(first.status).toBe(201);
    const second = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'B', password: 'second password here' });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('invitation_used');
    const [{ count }] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS count FROM users WHERE email = :email`,
      { replacements: { email }, type: 'SELECT' },
    )) as unknown as [{ count: number }];
    expect(count).toBe(1);
    // The first password still works; the second never took effect.
    await signIn(ctx.app, email, 'first password here');
  });

  test('when the same link is accepted twice at the same moment, then exactly one account is made', async () => {
    const email = unique();
    const { token } = await invite(email);
    const results = await Promise.all(
      [1, 2].map((n) =>
        request(ctx.app)
          .post(`/api/invitations/${token}/accept`)
          .send({ email, name: `N${n}`, password: `parallel password ${n}` }),
      ),
    );
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
  });

  test('when the link has expired, then it is refused with a clear message and no account is made', async () => {
    const email = unique();
    const { invitationId } = await invite(email);
    const past = new Date(Date.now() - 60_000);
    await ctx.sequelize.query(`UPDATE invitations SET expires_at = :past WHERE id = :id`, {
      replacements: { past, id: invitationId },
    });
    const token = signInvitationToken(
      { id: invitationId, clinicId: clinic.id, email, expiresAt: past },
      ctx.jwtSecret,
    );
    const preview = await request(ctx.app).get(`/api/invitations/${token}`);
    expect(preview.status).toBe(410);
    expect(preview.body.error.code).toBe('invitation_expired');
    const accept = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Late', password: 'too late password' });
    expect(accept.status).toBe(410);
    expect(accept.body.error.message).toMatch(/expired/);
  });

  test('when the link was tampered with, then it is not valid', async () => {
    const { token } = await invite(unique());
    const [payload, sig] = token.split('~');
    const forged = `${payload}~${sig.slice(0, -2)}${sig.endsWith('AA') ? 'BB' : 'AA'}`;
    const res = await request(ctx.app).get(`/api/invitations/${forged}`);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('invitation_invalid');
  });

  test('when an invitation is withdrawn, then its link stops working', async () => {
    const email = unique();
    const { invitationId, token } = await invite(email);
    const del = await request(ctx.app)
      .delete(`/api/team/invitations/${invitationId}`)
      .set('authorization', `Bearer ${admin}`);
    expect(del.status).toBe(204);
    const res = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'X', password: 'withdrawn password' });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('invitation_revoked');
  });

  test('when the link is used with another address, then it is refused, no account is made, and the invited address still can join', async () => {
    const email = unique();
    const other = unique();
    const { token } = await invite(email);
    const wrong = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email: other, name: 'Someone Else', password: 'someone else password' });
    expect(wrong.status).toBe(403);
    expect(wrong.body.error).toMatchObject({
      code: 'invitation_other_address',
      message: expect.stringMatching(/sent to another e-mail address/),
    });
    const [{ count }] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS count FROM users WHERE email IN (:emails)`,
      { replacements: { emails: [email, other] }, type: 'SELECT' },
    )) as unknown as [{ count: number }];
    expect(count).toBe(0);
    const right = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email: email.toUpperCase(), name: 'Rowan Vale', password: 'the invitee password' });
    expect(right.status).toBe(201);
    expect(right.body.user.email).toBe(email);
  });

  test('when a link is signed for the same invitation but another clinic or another address, then it is not valid', async () => {
    const email = unique();
    const { invitationId } = await invite(email);
    const expiresAt = new Date(Date.now() + 3_600_000);
    const otherClinic = await makeClinic('Elsewhere');
    for (const binding of [
      { id: invitationId, clinicId: otherClinic.id, email, expiresAt },
      { id: invitationId, clinicId: clinic.id, email: unique(), expiresAt },
    ]) {
      const token = signInvitationToken(binding, ctx.jwtSecret);
      const preview = await request(ctx.app).get(`/api/invitations/${token}`);
      expect(preview.status).toBe(404);
      expect(preview.body.error.code).toBe('invitation_invalid');
      const accept = await request(ctx.app)
        .post(`/api/invitations/${token}/accept`)
        .send({ email: binding.email, name: 'Forger', password: 'forged link password' });
      expect(accept.status).toBe(404);
    }
  });

  test('when an invitation is accepted, then the audit log records who joined, in which clinic, from which invitation', async () => {
    const email = unique();
    const { invitationId, token } = await invite(email, 'operator');
    const accepted = await request(ctx.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ email, name: 'Audited Joiner', password: 'audited joiner password' });
    expect(accepted.status).toBe(201);
    const events = (await ctx.sequelize.query(
      `SELECT clinic_id, user_id, entity_id, details FROM audit_events WHERE action = 'team.invitation_accepted' AND entity_id = :id`,
      { replacements: { id: invitationId }, type: 'SELECT' },
    )) as { clinic_id: string; user_id: string; entity_id: string; details: { role: string } }[];
    expect(events).toEqual([
      {
        clinic_id: clinic.id,
        user_id: accepted.body.user.id,
        entity_id: invitationId,
        details: { role: 'operator' },
      },
    ]);
  });

  test('when an address already has an account, then it cannot be invited again', async () => {
    const res = await request(ctx.app)
      .post('/api/team/invitations')
      .set('authorization', `Bearer ${admin}`)
      .send({ email: clinic.users.operator.email, name: 'Dup', role: 'operator' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('email_in_use');
  });
});

describe('roles and disabling', () => {
  test('when a user is disabled, then their current access token and refresh token stop working at once', async () => {
    const c = await makeClinic('Disable');
    const adminToken = (await signIn(ctx.app, c.users.admin.email)).accessToken;
    const operator = await signIn(ctx.app, c.users.operator.email);
    expect(
      (await request(ctx.app).get('/api/me').set('authorization', `Bearer ${operator.accessToken}`)).status,
    ).toBe(200);

    const res = await request(ctx.app)
      .patch(`/api/team/users/${c.users.operator.id}`)
      .set('authorization', `Bearer ${adminToken}`)
      .send({ disabled: true });
    expect(res.status).toBe(200);
    const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${operator.accessToken}`);
    expect(me.status).toBe(401);
    expect(me.body.error.code).toBe('account_disabled');
    const refresh = await request(ctx.app)
      .post('/api/auth/refresh')
      .send({ refreshToken: operator.refreshToken });
    expect(refresh.status).toBe(401);
  });

  test('when the last active admin would be demoted or disabled, then it is refused; with a second admin it is allowed', async () => {
    const c = await makeClinic('LastAdmin');
    const adminToken = (await signIn(ctx.app, c.users.admin.email)).accessToken;
    const demote = await request(ctx.app)
      .patch(`/api/team/users/${c.users.admin.id}`)
      .set('authorization', `Bearer ${adminToken}`)
      .send({ role: 'practitioner' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('last_admin');
    const disable = await request(ctx.app)
      .patch(`/api/team/users/${c.users.admin.id}`)
      .set('authorization', `Bearer ${adminToken}`)
      .send({ disabled: true });
    expect(disable.status).toBe(409);

    const promote = await request(ctx.app)
      .patch(`/api/team/users/${c.users.practitioner.id}`)
      .set('authorization', `Bearer ${adminToken}`)
      .send({ role: 'admin' });
    expect(promote.status).toBe(200);
    const nowOk = await request(ctx.app)
      .patch(`/api/team/users/${c.users.admin.id}`)
      .set('authorization', `Bearer ${adminToken}`)
      .send({ role: 'operator' });
    expect(nowOk.status).toBe(200);
    expect(nowOk.body.user.role).toBe('operator');
  });

  test('when two admins demote each other at the same moment, then one admin remains', async () => {
    const c = await makeClinic('Race');
    const a = (await signIn(ctx.app, c.users.admin.email)).accessToken;
    await request(ctx.app)
      .patch(`/api/team/users/${c.users.practitioner.id}`)
      .set('authorization', `Bearer ${a}`)
      .send({ role: 'admin' });
    const b = (await signIn(ctx.app, c.users.practitioner.email)).accessToken;
    const results = await Promise.all([
      request(ctx.app)
        .patch(`/api/team/users/${c.users.practitioner.id}`)
        .set('authorization', `Bearer ${a}`)
        .send({ role: 'operator' }),
      request(ctx.app)
        .patch(`/api/team/users/${c.users.admin.id}`)
        .set('authorization', `Bearer ${b}`)
        .send({ role: 'operator' }),
    ]);
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 200).length).toBeLessThanOrEqual(1);
    const [{ count }] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS count FROM users WHERE clinic_id = :id AND role = 'admin' AND NOT disabled`,
      { replacements: { id: c.id }, type: 'SELECT' },
    )) as unknown as [{ count: number }];
    expect(count).toBe(1);
  });

  test('when the team is listed, then users and invitations of this clinic only are shown', async () => {
    const res = await request(ctx.app).get('/api/team').set('authorization', `Bearer ${admin}`);
    expect(res.status).toBe(200);
    const emails = res.body.users.map((u: { email: string }) => u.email);
    expect(emails).toContain(clinic.users.admin.email);
    const other = await makeClinic('Other');
    expect(emails).not.toContain(other.users.admin.email);
  });
});
