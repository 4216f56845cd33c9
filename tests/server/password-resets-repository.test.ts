// The password_resets repository: a link is marked used once (OWASP ASVS 4.0.3 V2.5.x: a recovery link works
// once), and an unknown link is said as not_found rather than a missing row.
import { randomUUID } from 'node:crypto';
import {
  findPasswordReset,
  insertPasswordReset,
  markPasswordResetUsed,
} from '@/sync-server/src/repositories/password-resets-repository';
import { makeClinic, makeTestContext, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let clinic: TestClinic;
beforeAll(async () => {
  clinic = await makeClinic('ResetRows');
});
afterAll(() => ctx.close());

test('when a reset is marked used twice, then the first is marked and the second finds it already used', async () => {
  const id = randomUUID();
  const userId = clinic.users.operator.id;
  await insertPasswordReset(ctx.sequelize, { id, userId, expiresAt: new Date(Date.now() + 60_000) });
  const found = await findPasswordReset(ctx.sequelize, id);
  expect(found).toMatchObject({ kind: 'found', reset: { id, user_id: userId, used_at: null } });
  expect(await markPasswordResetUsed(ctx.sequelize, id)).toEqual({ kind: 'marked' });
  expect(await markPasswordResetUsed(ctx.sequelize, id)).toEqual({ kind: 'already_used' });
  expect(await findPasswordReset(ctx.sequelize, id)).toMatchObject({
    kind: 'found',
    reset: { used_at: expect.any(Date) },
  });
});

test('when a reset is not there, then it is not_found', async () => {
  expect(await findPasswordReset(ctx.sequelize, randomUUID())).toEqual({ kind: 'not_found' });
});
