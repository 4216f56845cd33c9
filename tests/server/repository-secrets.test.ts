// What this proves: nothing written in the repository can sign a payment webhook or an access token the server
// accepts, configured or not; only the secret this run generated can. OWASP ASVS 4.0.3 V2.10.4: "passwords,
// integrations with databases and third-party systems, seeds and internal secrets, and API keys are managed
// securely and not included in the source code or stored within source code repositories."
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import Stripe from 'stripe';
import { readSecrets } from '@/sync-server/src/config/secrets';
import { paymentsServiceFromEnv } from '@/sync-server/src/services/payments';
import { signAccessToken, verifyAccessToken } from '@/sync-server/src/services/tokens';
import { repositoryStrings } from './helpers/repository-strings';
import { startPracticeFakes, type PracticeFakes } from './helpers/practice-fakes';
import { insertClient } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

jest.setTimeout(180_000);
const ctx = makeTestContext();
let fakes: PracticeFakes;
let clinic: TestClinic;
let admin: string;
let strings: string[];
// The SDK's own test-header generator: signatures made exactly as the provider makes them.
const sdk = new Stripe(readSecrets().payments.secretKey);

beforeAll(async () => {
  strings = [...repositoryStrings()];
  fakes = await startPracticeFakes(ctx);
  clinic = await makeClinic('Forgery');
  ({ admin } = await tokensFor(ctx.app, clinic));
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

/** A pending payment and the event that would mark it paid. */
async function pendingPaymentAndForgedEvent() {
  const clientId = await insertClient(ctx.sequelize, clinic.id);
  const res = await request(ctx.app)
    .post('/api/billing/payments')
    .set('authorization', `Bearer ${admin}`)
    .send({ clientId, offerId: 'package-5' });
  expect(res.status).toBe(201);
  const paymentId: string = res.body.payment.id;
  // Event ids are unique per run: the server applies each one once, ever.
  const run = randomUUID().slice(0, 8);
  const payload = (eventId: string) =>
    JSON.stringify({
      id: `${eventId}_${run}`,
      object: 'event',
      type: 'checkout.session.completed',
      data: {
        object: {
          id: `cs_forged_${eventId}`,
          object: 'checkout.session',
          payment_status: 'paid',
          metadata: { paymentId },
        },
      },
    });
  const status = async () =>
    (
      (await ctx.sequelize.query(`SELECT status FROM payments WHERE id = :paymentId`, {
        replacements: { paymentId },
        type: 'SELECT',
      })) as unknown as [{ status: string }]
    )[0].status;
  return { payload, status };
}

const signedWith = (payload: string, secret: string) =>
  sdk.webhooks.generateTestHeaderString({ payload, secret });

describe('secrets found in the repository', () => {
  test('when the repository is read, then its strings are found (the check below has something to check)', () => {
    expect(strings.length).toBeGreaterThan(1000);
    expect(strings).toContain('checkout.session.completed');
    expect(strings).toContain('whsec_');
    expect(strings).not.toContain(readSecrets().payments.webhookSecret);
  });

  test('when a webhook marking a payment paid is signed with any string in the repository, then the server refuses it and the payment stays pending', async () => {
    const { payload, status } = await pendingPaymentAndForgedEvent();
    const accepted: string[] = [];
    // In batches over one keep-alive agent: thousands of posts, a few dozen at a time.
    for (let i = 0; i < strings.length; i += 50) {
      await Promise.all(
        strings.slice(i, i + 50).map(async (candidate, j) => {
          const body = payload(`evt_forged_${i + j}`);
          const res = await fetch(`${fakes.baseUrl}/webhooks/payments`, {
            method: 'POST',
            headers: { 'content-type': 'application/json', 'stripe-signature': signedWith(body, candidate) },
            body,
          });
          const answer = (await res.json()) as { error?: { code: string } };
          if (res.status !== 400 || answer.error?.code !== 'bad_signature') accepted.push(candidate);
        }),
      );
    }
    expect(accepted).toEqual([]);
    expect(await status()).toBe('pending');

    const genuine = payload('evt_genuine');
    const res = await fetch(`${fakes.baseUrl}/webhooks/payments`, {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'stripe-signature': signedWith(genuine, readSecrets().payments.webhookSecret),
      },
      body: genuine,
    });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ received: true, applied: 'paid' });
    expect(await status()).toBe('paid');
  });

  test('when nothing is configured (no NODE_ENV=production, no secrets), then no string in the repository signs a webhook either', () => {
    const unconfigured = paymentsServiceFromEnv({ NODE_ENV: 'development' });
    const payload = JSON.stringify({
      id: 'evt_unconfigured',
      object: 'event',
      type: 'ping',
      data: { object: {} },
    });
    const accepted = strings.filter((candidate) => {
      try {
        unconfigured.parseWebhook(payload, signedWith(payload, candidate));
        return true;
      } catch {
        return false;
      }
    });
    expect(accepted).toEqual([]);
  });

  test('when an access token is signed with any string in the repository, then the server does not accept it', () => {
    const claims = {
      userId: clinic.users.admin.id,
      role: 'admin' as const,
      clinicId: clinic.id,
      sessionId: randomUUID(),
    };
    const accepted = strings.filter(
      (candidate) => verifyAccessToken(signAccessToken(claims, candidate), readSecrets().jwtSecret) !== null,
    );
    expect(accepted).toEqual([]);
    expect(
      verifyAccessToken(signAccessToken(claims, readSecrets().jwtSecret), readSecrets().jwtSecret),
    ).not.toBeNull();
  });
});
