import jwt from 'jsonwebtoken';
import request from 'supertest';
import { signInResponseSchema } from '@/shared/protocol';
import { execute } from '@/sync-server/src/repositories/sql';
import { hashRefreshToken } from '@/sync-server/src/services/tokens';
import { REUSE_GRACE_MS } from '@/sync-server/src/use-cases/auth';
import {
  makeClinic,
  makeSiblingApp,
  makeTestContext,
  TEST_PASSWORD,
  type TestClinic,
} from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
beforeAll(async () => {
  clinic = await makeClinic('Cookie');
});
afterAll(() => ctx.close());

/** The attributes of the refresh cookie in a Set-Cookie header (RFC 6265 §4.1), names lower-cased. */
function refreshCookie(headers: Record<string, unknown>): { value: string; attributes: Map<string, string> } {
  const cookies = (headers['set-cookie'] as string[] | undefined) ?? [];
  const line = cookies.find((c) => c.startsWith('fourpoint_refresh='));
  if (!line) throw new Error(`no refresh cookie in ${JSON.stringify(cookies)}`);
  const [pair, ...parts] = line.split(';').map((p) => p.trim());
  const attributes = new Map(
    parts.map((p) => {
      const [name, ...value] = p.split('=');
      return [name.toLowerCase(), value.join('=')] as const;
    }),
  );
  return { value: pair.slice('fourpoint_refresh='.length), attributes };
}

const webSignIn = (app = ctx.app, email = clinic.users.operator.email) =>
  request(app).post('/api/auth/sign-in').send({ email, password: TEST_PASSWORD, refreshTokenIn: 'cookie' });

describe('the web refresh cookie (ASVS 4.0.3 V3.4)', () => {
  test('when the web app signs in, then the refresh token is an httpOnly, SameSite=Strict cookie for /api/auth and not in the body', async () => {
    const res = await webSignIn();
    expect(res.status).toBe(200);
    const body = signInResponseSchema.parse(res.body);
    expect(body.refreshToken).toBeUndefined();
    expect(body.accessToken).not.toBe('');
    const cookie = refreshCookie(res.headers);
    expect(cookie.value.length).toBeGreaterThan(40);
    expect(cookie.attributes.has('httponly')).toBe(true); // V3.4.2
    expect(cookie.attributes.get('samesite')).toBe('Strict'); // V3.4.3
    expect(cookie.attributes.get('path')).toBe('/api/auth'); // V3.4.5
    // Plain http here (a test): Secure would make the browser drop it. Over https it is set (next test).
    expect(cookie.attributes.has('secure')).toBe(false);
    expect(Number(cookie.attributes.get('max-age'))).toBe(30 * 24 * 60 * 60);
  });

  test('when the request came over https through a trusted proxy, then the cookie is Secure (V3.4.1)', async () => {
    const behindProxy = makeSiblingApp(ctx, { trustProxy: 1 });
    const res = await request(behindProxy)
      .post('/api/auth/sign-in')
      .set('x-forwarded-proto', 'https')
      .send({ email: clinic.users.admin.email, password: TEST_PASSWORD, refreshTokenIn: 'cookie' });
    expect(res.status).toBe(200);
    expect(refreshCookie(res.headers).attributes.has('secure')).toBe(true);
  });

  test('when a device signs in without asking for the cookie, then the refresh token comes in the body and no cookie is set', async () => {
    const res = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: clinic.users.operator.email, password: TEST_PASSWORD });
    expect(signInResponseSchema.parse(res.body).refreshToken).toBeDefined();
    expect(res.headers['set-cookie']).toBeUndefined();
  });

  test('when the browser refreshes with the cookie and a JSON body, then a new access token and a rotated cookie come back', async () => {
    const first = refreshCookie((await webSignIn()).headers).value;
    const res = await request(ctx.app)
      .post('/api/auth/refresh')
      .set('cookie', `fourpoint_refresh=${first}`)
      .send({});
    expect(res.status).toBe(200);
    const body = signInResponseSchema.parse(res.body);
    expect(body.refreshToken).toBeUndefined();
    const second = refreshCookie(res.headers).value;
    expect(second).not.toBe(first);
    // The first cookie is spent: sending it again after the reuse window is a replay and ends the sign-in,
    // cookie cleared.
    await execute(
      ctx.sequelize,
      `UPDATE refresh_tokens SET revoked_at = :revokedAt WHERE token_hash = :tokenHash`,
      {
        revokedAt: new Date(Date.now() - 2 * REUSE_GRACE_MS),
        tokenHash: hashRefreshToken(first),
      },
    );
    const replay = await request(ctx.app)
      .post('/api/auth/refresh')
      .set('cookie', `fourpoint_refresh=${first}`)
      .send({});
    expect(replay.status).toBe(401);
    expect(refreshCookie(replay.headers).attributes.get('expires')).toMatch(/1970/);
    const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${body.accessToken}`);
    expect(me.status).toBe(401);
  });

  test('when the cookie comes with a form post instead of JSON, then it is refused 415 and the token is not used (CSRF, V4.2.2)', async () => {
    const cookie = refreshCookie((await webSignIn()).headers).value;
    for (const type of [
      'application/x-www-form-urlencoded',
      'text/plain',
      'multipart/form-data; boundary=x',
    ]) {
      const res = await request(ctx.app)
        .post('/api/auth/refresh')
        .set('cookie', `fourpoint_refresh=${cookie}`)
        .set('content-type', type)
        .send('a=b');
      expect(res.status).toBe(415);
      expect(res.body.error.message).toMatch(/JSON/);
    }
    const out = await request(ctx.app)
      .post('/api/auth/sign-out')
      .set('cookie', `fourpoint_refresh=${cookie}`)
      .set('content-type', 'text/plain')
      .send('x');
    expect(out.status).toBe(415);
    // Still good: none of those requests spent or ended it.
    const ok = await request(ctx.app)
      .post('/api/auth/refresh')
      .set('cookie', `fourpoint_refresh=${cookie}`)
      .send({});
    expect(ok.status).toBe(200);
  });

  test('when the web app signs out, then the cookie is cleared, the refresh token is dead and the old access token gets 401', async () => {
    const signedIn = await webSignIn();
    const { accessToken } = signInResponseSchema.parse(signedIn.body);
    const cookie = refreshCookie(signedIn.headers).value;
    expect((jwt.decode(accessToken) as { sid?: string }).sid).toBeDefined();
    const out = await request(ctx.app)
      .post('/api/auth/sign-out')
      .set('cookie', `fourpoint_refresh=${cookie}`)
      .set('authorization', `Bearer ${accessToken}`)
      .send({});
    expect(out.status).toBe(204);
    const cleared = refreshCookie(out.headers);
    expect(cleared.value).toBe('');
    expect(cleared.attributes.get('path')).toBe('/api/auth');
    const me = await request(ctx.app).get('/api/me').set('authorization', `Bearer ${accessToken}`);
    expect(me.status).toBe(401);
    const refresh = await request(ctx.app)
      .post('/api/auth/refresh')
      .set('cookie', `fourpoint_refresh=${cookie}`)
      .send({});
    expect(refresh.status).toBe(401);
  });

  test('when a refresh carries neither a body token nor a cookie, then it is 400 with what to do', async () => {
    const res = await request(ctx.app).post('/api/auth/refresh').send({});
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({
      code: 'refresh_token_missing',
      message: 'No refresh token was sent. Sign in again.',
    });
  });
});
