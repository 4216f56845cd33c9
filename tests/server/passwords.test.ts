import { randomUUID } from 'node:crypto';
import bcrypt from 'bcryptjs';
import request from 'supertest';
import { newPasswordSchemaFor, PASSWORD_MIN_LENGTH } from '@/shared/protocol';
import { createUser, findUserForRefreshToken } from '@/sync-server/src/repositories/users-repository';
import { assertAcceptablePassword, MIN_ZXCVBN_SCORE } from '@/sync-server/src/services/password-policy';
import { hashPassword, verifyPassword } from '@/sync-server/src/services/passwords';
import { makeClinic, makeTestContext, signIn } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

const email = 'juniper.okafor@clinic.fourpoint.test';
const refusal = (password: string, forEmail = email): string | null => {
  try {
    assertAcceptablePassword(password, forEmail);
    return null;
  } catch (error) {
    return (error as Error).message;
  }
};

describe('the rule for a new password', () => {
  test('when a password is shorter than 12 characters, then it is refused with what to do (ASVS 4.0.3 V2.1.1)', () => {
    expect(PASSWORD_MIN_LENGTH).toBe(12);
    expect(refusal('Zq8#vLp2!mW')).toMatch(/^Use at least 12 characters\./);
    // Characters, not UTF-16 units: six emoji are six characters (ASVS V2.1.4: any printable Unicode).
    expect(refusal('🫀🫀🫀🫀🫀🫀')).toMatch(/at least 12 characters/);
  });

  test('when a password is long and unguessable, then it is accepted, spaces and Unicode included (ASVS V2.1.3, V2.1.4)', () => {
    expect(refusal('tidewater brass lantern')).toBeNull();
    expect(refusal('quiet ölbaum harbour 🫀 kite')).toBeNull();
  });

  // NIST SP 800-63B §5.1.1.2: refuse passwords from breach corpuses, dictionary words, repetitive or sequential
  // characters, and context-specific words such as the name of the service or the username.
  test.each([
    ['a breached, common password', 'password1234'],
    ['a keyboard walk', 'qwertyuiop123'],
    ['sequential digits', '123456789012'],
    ['repeated characters', 'aaaaaaaaaaaa'],
    ['the service name', 'fourpoint2026'],
  ])('when the password is %s, then it is refused as too easy to guess', (_what, password) => {
    expect(refusal(password)).toMatch(
      /^This password is too easy to guess\..*Use three or four unrelated words, or a longer phrase/,
    );
  });

  test(`when the password is or contains the e-mail or its name part, then it is refused (zxcvbn score < ${MIN_ZXCVBN_SCORE} aside)`, () => {
    const message = /Do not use your e-mail address, or the part before the @, in your password\./;
    expect(refusal(email)).toMatch(message);
    expect(refusal(`${email.toUpperCase()}!!`)).toMatch(message);
    expect(refusal('my juniper.okafor password')).toMatch(message);
  });

  test('when the app checks a form, then the shared schema applies the length and e-mail rules with the same messages', () => {
    const schema = newPasswordSchemaFor(email);
    expect(schema.safeParse('tidewater brass lantern').success).toBe(true);
    expect(schema.safeParse('short').error?.issues[0].message).toBe(refusal('short'));
    expect(schema.safeParse(`x${email}`).error?.issues[0].message).toBe(refusal(`x${email}`));
  });
});

// The cheat sheet's first argon2id configuration: m=19 MiB (19456 KiB), t=2, p=1.
const owaspArgon2id = { algorithm: 'argon2id', m: '19456', t: '2', p: '1' };
/** PHC string format: $argon2id$v=19$m=<KiB>,t=<iterations>,p=<lanes>$salt$hash (parameters in any order). */
function phcParameters(hash: string): Record<string, string> {
  const [, algorithm, , parameters] = hash.split('$');
  return { algorithm, ...Object.fromEntries(parameters.split(',').map((kv) => kv.split('='))) };
}

describe('password storage (OWASP Password Storage Cheat Sheet, ASVS V2.4)', () => {
  test('when a password is hashed, then it is argon2id with 19 MiB, 2 iterations and 1 lane', async () => {
    expect(phcParameters(await hashPassword('tidewater brass lantern'))).toEqual(owaspArgon2id);
  });

  test('when two passwords share their first 72 bytes, then only the right one verifies (no bcrypt truncation)', async () => {
    const head = 'x'.repeat(72);
    const hash = await hashPassword(`${head}-right-end`);
    expect((await verifyPassword(`${head}-right-end`, hash)).ok).toBe(true);
    expect((await verifyPassword(`${head}-other-end`, hash)).ok).toBe(false);
  });

  test('when a user with an old bcrypt hash signs in, then it works and the hash becomes argon2id', async () => {
    const clinic = await makeClinic('Bcrypt');
    const password = 'an old bcrypt-era password';
    const id = randomUUID();
    await createUser(ctx.sequelize, clinic.id, {
      id,
      email: `legacy.${id}@test.fourpoint.test`,
      name: 'Legacy User',
      role: 'operator',
      passwordHash: await bcrypt.hash(password, 10),
    });
    const wrong = await request(ctx.app)
      .post('/api/auth/sign-in')
      .send({ email: `legacy.${id}@test.fourpoint.test`, password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect((await findUserForRefreshToken(ctx.sequelize, id))!.passwordHash).toMatch(/^\$2[aby]\$/);

    await signIn(ctx.app, `legacy.${id}@test.fourpoint.test`, password);
    const upgraded = (await findUserForRefreshToken(ctx.sequelize, id))!.passwordHash;
    expect(phcParameters(upgraded)).toEqual(owaspArgon2id);
    await signIn(ctx.app, `legacy.${id}@test.fourpoint.test`, password);
  });
});
