import jwt from 'jsonwebtoken';
import type { Express } from 'express';
import request from 'supertest';
import { meResponseSchema, signInResponseSchema } from '@/shared/protocol';
import { execute, selectRows } from '@/sync-server/src/repositories/sql';
import { updateTeamUser } from '@/sync-server/src/repositories/users-repository';
import { hashRefreshToken } from '@/sync-server/src/services/tokens';
import { REUSE_GRACE_MS } from '@/sync-server/src/use-cases/auth';
import {
  auditEventsWhere,
  makeClinic,
  makeSiblingApp,
  makeTestContext,
  signIn,
  TEST_PASSWORD,
  type TestClinic,
} from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;

beforeAll(async () => {
  clinic = await makeClinic('Auth');
});
afterAll(() => ctx.close());

/** Moves a spent refresh token's rotation past the reuse window (REUSE_GRACE_MS), so using it again is a replay. */
async function rotatedLongAgo(refreshToken: string): Promise<void> {
  await execute(
    ctx.sequelize,
    `UPDATE refresh_tokens SET revoked_at = :revokedAt WHERE token_hash = :tokenHash`,
    {
      revokedAt: new Date(Date.now() - 2 * REUSE_GRACE_MS),
      tokenHash: hashRefreshToken(refreshToken),
    },
  );
}

describe('sign-in', () => {
  test('when the e-mail and password are right, then it answers tokens and the user', async () => {
    const user = clinic.users.practitioner;
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    const body = signInResponseSchema.parse(res.body);
    expect(body.user).toEqual({
      id: user.id,
      email: user.email,
      role: 'practitioner',
      clinicId: clinic.id,
      name: user.name,
      // A new clinic writes its dates in UTC until its admin chooses a zone.
      timeZone: 'UTC',
    });
    const claims = jwt.verify(body.accessToken, ctx.jwtSecret) as jwt.JwtPayload;
    expect(claims).toMatchObject({ sub: user.id, role: 'practitioner', clinicId: clinic.id });
    // 15 minutes: the brief's lifetime for access tokens.
    expect(claims.exp! - claims.iat!).toBe(15 * 60);
    const [audit] = await auditEventsWhere({ userId: user.id, action: 'auth.sign_in' });
    expect(audit?.clinicId).toBe(clinic.id);
  });

  test('when the e-mail differs only in case and spaces, then it still signs in', async () => {
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: `  ${clinic.users.operator.email.toUpperCase()} `.trim(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  test('when the password is wrong or the e-mail unknown, then both answers are the same 401', async () => {
    const wrong = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: clinic.users.admin.email, password: 'not-it' });
    const unknown = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: `nobody.${clinic.id}@test.fourpoint.test`, password: 'not-it' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
  });

  test('when an account’s password is wrong, then the failure is in its clinic’s audit log without the password (ASVS V7.1.1, V7.2.1)', async () => {
    const tried = `wrong-password-${clinic.id}`;
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: clinic.users.operator.email, password: tried });
    expect(res.status).toBe(401);
    const events = await auditEventsWhere({
      userId: clinic.users.operator.id,
      action: 'auth.sign_in_failed',
    });
    expect(events).toHaveLength(1);
    expect(events[0].clinicId).toBe(clinic.id);
    expect(JSON.stringify(events[0])).not.toContain(tried);
  });

  test('when the body is not an e-mail and password, then it is 400 with a readable message', async () => {
    const res = await request(ctx.app).post('/api/auth/sign-in').send({ email: 'not-an-email' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.message).toMatch(/e-mail/);
  });

  test('when the body is malformed JSON, then it is 400 malformed_json', async () => {
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .set('content-type', 'application/json')
      .send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
  });

  test('when one address fails ten times for one account, then the eleventh try is 429 JSON even with the right password', async () => {
    const limited = makeSiblingApp(ctx);
    {
      const email = clinic.users.operator.email;
      for (let i = 0; i < 10; i++) {
        const res = await request(limited)
          .post('/api/auth/sign-in')
          .send({ email, password: `wrong-${i}` });
        expect(res.status).toBe(401);
      }
      const blocked = await request(limited)
        .post('/api/auth/sign-in')
        .send({ email, password: TEST_PASSWORD });
      expect(blocked.status).toBe(429);
      expect(blocked.body.error).toEqual({
        code: 'too_many_attempts',
        message: expect.stringMatching(/Wait 15 minutes/),
      });
      // Another account from the same address still gets its own ten tries.
      const other = await request(limited)
        .post('/api/auth/sign-in')
        .send({ email: clinic.users.admin.email, password: TEST_PASSWORD });
      expect(other.status).toBe(200);
    }
  });

  test('when one address tries many accounts, then the per-address limit stops it', async () => {
    const limited = makeSiblingApp(ctx, {
      signInLimits: { windowMs: 60_000, perAccount: 10, perAddress: 3 },
    });
    {
      for (let i = 0; i < 3; i++) {
        const res = await request(limited)
          .post('/api/auth/sign-in')
          .send({ email: `guess${i}.${clinic.id}@test.fourpoint.test`, password: 'x' });
        expect(res.status).toBe(401);
      }
      const res = await request(limited)
        .post('/api/auth/sign-in')
        .send({ email: `guess9.${clinic.id}@test.fourpoint.test`, password: 'x' });
      expect(res.status).toBe(429);
    }
  });
});

describe('refresh and sign-out', () => {
  test('when a refresh token is used, then a new pair comes back and the old token is revoked', async () => {
    const first = await signIn(ctx.app, clinic.users.operator.email);
    const res = await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken });
    expect(res.status).toBe(200);
    const second = signInResponseSchema.parse(res.body);
    expect(second.refreshToken).not.toBe(first.refreshToken);
    expect(second.user.id).toBe(clinic.users.operator.id);
    const [old] = await selectRows<{ revoked_at: Date | null; replaced_by: string | null }>(
      ctx.sequelize,
      `SELECT revoked_at, replaced_by FROM refresh_tokens WHERE token_hash = :tokenHash`,
      { tokenHash: hashRefreshToken(first.refreshToken!) },
    );
    expect(old?.revoked_at).toBeInstanceOf(Date);
    expect(old?.replaced_by).not.toBeNull();
    const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${second.accessToken}`);
    expect(me.status).toBe(200);
  });

  test('when a revoked refresh token is used again, then it is refused and its successor stops working too', async () => {
    const first = await signIn(ctx.app, clinic.users.operator.email);
    const rotated = (
      await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken })
    ).body as { refreshToken: string };
    await rotatedLongAgo(first.refreshToken!);
    const replay = await request(ctx.app)
      .post('/api/auth/refresh')
      .send({ refreshToken: first.refreshToken });
    expect(replay.status).toBe(401);
    expect(replay.body.error.code).toBe('invalid_refresh_token');
    const successor = await request(ctx.app)
      .post('/api/auth/refresh')
      .send({ refreshToken: rotated.refreshToken });
    expect(successor.status).toBe(401);
  });

  test('when the same refresh token is sent twice at once, then both get a pair in the same sign-in (a race, not a theft)', async () => {
    const first = await signIn(ctx.app, clinic.users.admin.email);
    const answers = await Promise.all(
      [1, 2].map(() => request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken })),
    );
    expect(answers.map((a) => a.status)).toEqual([200, 200]);
    const pairs = answers.map((a) => signInResponseSchema.parse(a.body));
    expect(pairs[0].refreshToken).not.toBe(pairs[1].refreshToken);
    for (const pair of pairs) {
      const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${pair.accessToken}`);
      expect(me.status).toBe(200);
    }
  });

  test('when a made-up refresh token is sent, then it is 401', async () => {
    const res = await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: 'made-up-token' });
    expect(res.status).toBe(401);
  });

  test('when a user signs out, then that refresh token no longer refreshes', async () => {
    const session = await signIn(ctx.app, clinic.users.practitioner.email);
    const out = await request(ctx.app)
      .post('/api/auth/sign-out')
      .send({ refreshToken: session.refreshToken });
    expect(out.status).toBe(204);
    const res = await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: session.refreshToken });
    expect(res.status).toBe(401);
    const again = await request(ctx.app)
      .post('/api/auth/sign-out')
      .send({ refreshToken: session.refreshToken });
    expect(again.status).toBe(204);
  });
});

describe('GET /api/me', () => {
  test('when a valid bearer token is sent, then it answers that user', async () => {
    const session = await signIn(ctx.app, clinic.users.admin.email);
    const res = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${session.accessToken}`);
    expect(res.status).toBe(200);
    expect(meResponseSchema.parse(res.body).user).toEqual(session.user);
  });

  test('when no token is sent, then it is 401 JSON', async () => {
    const res = await request(ctx.app).get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  test('when the token is signed with another secret, then it is 401', async () => {
    const forged = jwt.sign({ role: 'admin', clinicId: clinic.id }, 'someone-elses-secret', {
      subject: clinic.users.admin.id,
      issuer: 'fourpoint',
    });
    const res = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${forged}`);
    expect(res.status).toBe(401);
  });

  test('when the token has expired, then it is 401', async () => {
    const expired = jwt.sign(
      { role: 'admin', clinicId: clinic.id, exp: Math.floor(Date.now() / 1000) - 60 },
      ctx.jwtSecret,
      {
        subject: clinic.users.admin.id,
        issuer: 'fourpoint',
      },
    );
    const res = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${expired}`);
    expect(res.status).toBe(401);
  });

  test('when the token names a clinic the user is not in, then it is 401', async () => {
    const other = await makeClinic('Other');
    const own = await signIn(ctx.app, clinic.users.admin.email);
    const { sid } = jwt.decode(own.accessToken) as { sid: string };
    const crossed = jwt.sign({ role: 'admin', clinicId: other.id, sid }, ctx.jwtSecret, {
      subject: clinic.users.admin.id,
      issuer: 'fourpoint',
    });
    const res = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${crossed}`);
    expect(res.status).toBe(401);
  });
});

describe('disabled users', () => {
  test('when a signed-in user is disabled, then their access and refresh tokens stop working at once', async () => {
    const own = await makeClinic('Disable');
    const session = await signIn(ctx.app, own.users.operator.email);
    expect(
      (await request(ctx.app).get('/api/me').set('authorization', `Bearer ${session.accessToken}`)).status,
    ).toBe(200);

    await updateTeamUser(ctx.sequelize, own.id, own.users.operator.id, { role: 'operator', disabled: true });

    const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${session.accessToken}`);
    expect(me.status).toBe(401);
    expect(me.body.error.code).toBe('account_disabled');
    const refresh = await request(ctx.app)
      .post('/api/auth/refresh')
      .send({ refreshToken: session.refreshToken });
    expect(refresh.status).toBe(401);
  });

  test('when a disabled account signs in, then the answer is the wrong-password answer, right password or not (ASVS V2.2.1, no enumeration)', async () => {
    const own = await makeClinic('DisabledSignIn');
    await updateTeamUser(ctx.sequelize, own.id, own.users.operator.id, { role: 'operator', disabled: true });
    const send = (email: string, password: string) =>
      request(ctx.app).post('/api/auth/sign-in').send({ email, password });
    const disabledRight = await send(own.users.operator.email, TEST_PASSWORD);
    const disabledWrong = await send(own.users.operator.email, 'not-it-at-all');
    const activeWrong = await send(own.users.admin.email, 'not-it-at-all');
    const unknown = await send(`nobody.${own.id}@test.fourpoint.test`, 'not-it-at-all');
    for (const answer of [disabledRight, disabledWrong, unknown]) {
      expect(answer.status).toBe(activeWrong.status);
      expect(answer.body).toEqual(activeWrong.body);
    }
    expect(activeWrong.body.error.code).toBe('invalid_credentials');
  });
});

describe('the sign-in limit per account (ASVS V2.2.1)', () => {
  // Behind a trusted proxy, X-Forwarded-For gives each request the client address the test chooses.
  const fromAddress = (app: Express, address: string, email: string, password: string) =>
    request(app).post('/api/auth/sign-in').set('x-forwarded-for', address).send({ email, password });

  test('when one account fails ten times from ten addresses, then an eleventh address is refused with 429, Retry-After and a plain message', async () => {
    const limited = makeSiblingApp(ctx, { trustProxy: 1 });
    const email = clinic.users.practitioner.email;
    for (let i = 0; i < 10; i++)
      expect((await fromAddress(limited, `198.51.100.${i + 1}`, email, `wrong-${i}`)).status).toBe(401);
    const blocked = await fromAddress(limited, '203.0.113.77', email, TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    // RFC 9110 §10.2.3: Retry-After as delay-seconds; the window is 15 minutes.
    const retryAfter = Number(blocked.headers['retry-after']);
    expect(Number.isInteger(retryAfter)).toBe(true);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    expect(blocked.body.error).toEqual({
      code: 'too_many_attempts',
      message: expect.stringMatching(/^Too many sign-in attempts\. Wait (15|14) minutes and try again\.$/),
    });
    // The e-mail is counted normalised: capitals and spaces are the same account.
    const variant = await fromAddress(limited, '203.0.113.78', ` ${email.toUpperCase()} `.trim(), 'x');
    expect(variant.status).toBe(429);
  });

  test('when two server processes share the database, then failures on one count on the other', async () => {
    const own = await makeClinic('SharedLimit');
    const shared = { trustProxy: 1, rateLimitPrefix: `shared-${own.id}` };
    const first = makeSiblingApp(ctx, shared);
    const second = makeSiblingApp(ctx, shared);
    const email = own.users.admin.email;
    for (let i = 0; i < 10; i++) {
      const app = i % 2 === 0 ? first : second;
      expect((await fromAddress(app, `192.0.2.${i + 1}`, email, `wrong-${i}`)).status).toBe(401);
    }
    expect((await fromAddress(second, '192.0.2.200', email, TEST_PASSWORD)).status).toBe(429);
    // A successful sign-in of another account is not counted against anyone.
    expect((await fromAddress(first, '192.0.2.201', own.users.operator.email, TEST_PASSWORD)).status).toBe(
      200,
    );
  });
});

describe('sign-out ends the access token too (ASVS V3.3.1)', () => {
  const me = (token: string) => request(ctx.app).get('/api/me').set('authorization', `Bearer ${token}`);

  test('when a user signs out with the refresh token, then the old access token gets 401 and their other sign-in still works', async () => {
    const session = await signIn(ctx.app, clinic.users.operator.email);
    const otherDevice = await signIn(ctx.app, clinic.users.operator.email);
    expect((await me(session.accessToken)).status).toBe(200);
    const out = await request(ctx.app)
      .post('/api/auth/sign-out')
      .send({ refreshToken: session.refreshToken });
    expect(out.status).toBe(204);
    const after = await me(session.accessToken);
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('unauthenticated');
    expect((await me(otherDevice.accessToken)).status).toBe(200);
    const audit = await auditEventsWhere({ userId: clinic.users.operator.id, action: 'auth.sign_out' });
    expect(audit.length).toBeGreaterThan(0);
  });

  test('when a used refresh token is replayed, then the access tokens of that sign-in stop too', async () => {
    const first = await signIn(ctx.app, clinic.users.practitioner.email);
    const rotated = signInResponseSchema.parse(
      (await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken })).body,
    );
    expect((await me(rotated.accessToken)).status).toBe(200);
    await rotatedLongAgo(first.refreshToken!);
    await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken });
    expect((await me(rotated.accessToken)).status).toBe(401);
  });

  test('when a used refresh token comes back within seconds of its rotation, then it is a lost answer: fresh tokens, the sign-in goes on', async () => {
    // A page that reloads while its refresh is in flight never stores the rotated cookie and sends the old one.
    const first = await signIn(ctx.app, clinic.users.practitioner.email);
    const rotated = signInResponseSchema.parse(
      (await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken })).body,
    );
    const again = await request(ctx.app).post('/api/auth/refresh').send({ refreshToken: first.refreshToken });
    expect(again.status).toBe(200);
    const fresh = signInResponseSchema.parse(again.body);
    expect((await me(fresh.accessToken)).status).toBe(200);
    expect((await me(rotated.accessToken)).status).toBe(200);
  });

  test('when an access token carries no session id, then it is 401', async () => {
    const noSid = jwt.sign({ role: 'admin', clinicId: clinic.id }, ctx.jwtSecret, {
      subject: clinic.users.admin.id,
      issuer: 'fourpoint',
    });
    expect((await me(noSid)).status).toBe(401);
  });
});
