// Password reset by e-mail, against the real app, PostgreSQL and the SMTP fake. Checks follow OWASP ASVS 4.0.3:
// V2.5.x (recovery: same answer for every address, a single-use, short-lived link bound to the account, every
// session ended) and V2.1.x (the new password's rule, the same as for invitations).
import request from 'supertest';
import { startPracticeFakes, linkIn, messagesTo, type PracticeFakes } from './helpers/practice-fakes';
import { makeClinic, makeTestContext, signIn, TEST_PASSWORD, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let clinic: TestClinic;

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  clinic = await makeClinic('Reset');
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

// The mail goes out after the answer (so its timing says nothing about the address): wait until it is in.
async function resetLinkFor(email: string, count: number): Promise<string> {
  for (;;) {
    const mails = messagesTo(fakes.mail, email);
    if (mails.length >= count) {
      const link = linkIn(mails.at(-1)!.text, /http:\/\/127\.0\.0\.1:\d+\/reset-password\/[A-Za-z0-9_~-]+/);
      return link.split('/reset-password/')[1];
    }
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

async function auditActions(userId: string): Promise<string[]> {
  const rows = (await ctx.sequelize.query(
    `SELECT action FROM audit_events WHERE user_id = :userId ORDER BY id`,
    { replacements: { userId }, type: 'SELECT' },
  )) as { action: string }[];
  return rows.map((r) => r.action);
}

test('when an address with and one without an account ask for a reset, then both get the same 202 answer (ASVS V2.5.x)', async () => {
  const known = await request(ctx.app)
    .post('/api/auth/password-reset')
    .send({ email: clinic.users.operator.email });
  const unknown = await request(ctx.app)
    .post('/api/auth/password-reset')
    .send({ email: `nobody.${Date.now()}@reset.fourpoint.test` });
  expect(known.status).toBe(202);
  expect(unknown.status).toBe(202);
  expect(known.body).toEqual(unknown.body);
  expect(await resetLinkFor(clinic.users.operator.email, 1)).toMatch(/~/);
});

test('when the link is used with an acceptable password, then it works once, the old password and every sign-in end, and it is audited', async () => {
  const user = clinic.users.practitioner;
  const before = await signIn(ctx.app, user.email);
  expect(
    (await request(ctx.app).get('/api/me').set('authorization', `Bearer ${before.accessToken}`)).status,
  ).toBe(200);
  await request(ctx.app).post('/api/auth/password-reset').send({ email: user.email }).expect(202);
  const token = await resetLinkFor(user.email, 1);

  const preview = await request(ctx.app).get(`/api/auth/password-reset/${token}`);
  expect(preview.status).toBe(200);
  expect(preview.body.email).toBe(user.email);
  expect(new Date(preview.body.expiresAt).getTime() - Date.now()).toBeLessThanOrEqual(30 * 60 * 1000);

  // The rule of invitations: e-mail-based and common passwords are refused, and the link still works after.
  const weak = await request(ctx.app)
    .post(`/api/auth/password-reset/${token}`)
    .send({ password: `${user.email.split('@')[0]} and more` });
  expect(weak.status).toBe(400);
  const common = await request(ctx.app)
    .post(`/api/auth/password-reset/${token}`)
    .send({ password: 'password1234' });
  expect(common.status).toBe(400);

  const chosen = 'lantern meadow copper sleeve';
  const done = await request(ctx.app).post(`/api/auth/password-reset/${token}`).send({ password: chosen });
  expect(done.status).toBe(200);

  // Every earlier sign-in has ended; the old password no longer works; the new one does.
  expect(
    (await request(ctx.app).get('/api/me').set('authorization', `Bearer ${before.accessToken}`)).status,
  ).toBe(401);
  const refreshed = await request(ctx.app)
    .post('/api/auth/refresh')
    .send({ refreshToken: before.refreshToken });
  expect(refreshed.status).toBe(401);
  const old = await request(ctx.app)
    .post('/api/auth/sign-in')
    .send({ email: user.email, password: TEST_PASSWORD });
  expect(old.status).toBe(401);
  expect((await signIn(ctx.app, user.email, chosen)).user.email).toBe(user.email);

  const again = await request(ctx.app)
    .post(`/api/auth/password-reset/${token}`)
    .send({ password: 'another fine long password' });
  expect(again.status).toBe(409);
  expect(again.body.error.code).toBe('reset_link_used');

  const actions = await auditActions(user.id);
  expect(actions).toContain('auth.password_reset_requested');
  expect(actions).toContain('auth.password_reset');
});

test('when a link is altered or names another account, then it is refused and nothing changes', async () => {
  const user = clinic.users.admin;
  await request(ctx.app).post('/api/auth/password-reset').send({ email: user.email }).expect(202);
  const token = await resetLinkFor(user.email, 1);
  const [payload, signature] = token.split('~');
  const flipped = `${payload}~${signature.slice(0, -2)}${signature.endsWith('AA') ? 'BB' : 'AA'}`;
  for (const bad of [flipped, `${payload}~`, 'not-a-link-at-all', `${token}~extra`]) {
    const res = await request(ctx.app)
      .post(`/api/auth/password-reset/${bad}`)
      .send({ password: 'whatever it is now' });
    expect(res.status).toBe(404);
  }
  expect((await signIn(ctx.app, user.email)).user.email).toBe(user.email);
});

test('when one address asks again and again, then after a few requests it is told to wait, with the same words for an unknown address', async () => {
  const user = clinic.users.operator;
  const statuses: number[] = [];
  for (let i = 0; i < 5; i += 1)
    statuses.push(
      (await request(ctx.app).post('/api/auth/password-reset').send({ email: user.email })).status,
    );
  expect(statuses.filter((s) => s === 429).length).toBeGreaterThan(0);
  const limited = await request(ctx.app).post('/api/auth/password-reset').send({ email: user.email });
  expect(limited.status).toBe(429);
  expect(limited.body.error.code).toBe('too_many_attempts');
});
