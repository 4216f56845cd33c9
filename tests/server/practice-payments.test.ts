import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { SYNC_PROTOCOL_VERSION } from '@/shared/protocol/sync';
import { TEST_CARDS } from '@/sync-server/fakes/payments-fake';
import { signPayload } from '@/sync-server/fakes/payments-fake';
import { startPracticeFakes, linkIn, messagesTo, type PracticeFakes } from './helpers/practice-fakes';
import { insertClient, insertSession } from './helpers/practice-rows';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let clinic: TestClinic;
let admin: string;
let operator: string;

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  clinic = await makeClinic('Billing');
  ({ admin, operator } = await tokensFor(ctx.app, clinic));
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

async function openPayment(offerId = 'package-5') {
  const clientId = await insertClient(ctx.sequelize, clinic.id);
  const res = await request(ctx.app)
    .post('/api/billing/payments')
    .set('authorization', `Bearer ${admin}`)
    .send({ clientId, offerId });
  expect(res.status).toBe(201);
  const checkoutId = (await ctx.sequelize.query(`SELECT checkout_id FROM payments WHERE id = :id`, {
    replacements: { id: res.body.payment.id },
    type: 'SELECT',
  })) as unknown as [{ checkout_id: string }];
  return {
    clientId,
    payment: res.body.payment,
    emailed: res.body.emailed as boolean,
    checkoutId: checkoutId[0].checkout_id,
  };
}

const record = async (clientId: string) => {
  const res = await request(ctx.app)
    .get(`/api/client-records/${clientId}`)
    .set('authorization', `Bearer ${admin}`);
  expect(res.status).toBe(200);
  return res.body;
};
const paymentRow = async (id: string) =>
  (
    (await ctx.sequelize.query(`SELECT status, failure_reason FROM payments WHERE id = :id`, {
      replacements: { id },
      type: 'SELECT',
    })) as unknown as [{ status: string; failure_reason: string | null }]
  )[0];

describe('card payments through the provider fake', () => {
  test('when the client pays a package with the test card, then the signed webhook marks it paid and the package holds its visits', async () => {
    const { clientId, payment, emailed, checkoutId } = await openPayment();
    expect(payment.status).toBe('pending');
    expect(emailed).toBe(true);
    const client = await record(clientId);
    const mail = messagesTo(fakes.mail, client.client.email).at(-1)!;
    expect(linkIn(mail.text, /http:\/\/127\.0\.0\.1:\d+\/pay\/cs_test_[0-9a-f]+/)).toBe(payment.checkoutUrl);

    expect(await fakes.payments.pay(checkoutId, TEST_CARDS.success)).toEqual({ ok: true });
    expect((await paymentRow(payment.id)).status).toBe('paid');
    const after = await record(clientId);
    expect(after.packages).toEqual([
      expect.objectContaining({ visitsTotal: 5, visitsUsed: 0, visitsLeft: 5, status: 'active' }),
    ]);
  });

  test('when the payer uses the hosted page form, then our server never receives the card number', async () => {
    const { checkoutId } = await openPayment('test-visit');
    const form = new URLSearchParams({
      card_number: TEST_CARDS.success,
      exp: '12/30',
      cvc: '123',
      name: 'Wren',
    });
    const res = await fetch(`${fakes.payments.url}/pay/${checkoutId}`, {
      method: 'POST',
      body: form,
      redirect: 'manual',
    });
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toContain(`/payments/complete?session_id=${checkoutId}`);
    const delivered = fakes.payments.events.filter((e) => JSON.stringify(e).includes(checkoutId));
    expect(JSON.stringify(delivered)).not.toContain(TEST_CARDS.success);
    const page = await request(ctx.app).get(`/payments/complete?session_id=${checkoutId}`);
    expect(page.text).toContain('your payment is received');
  });

  test('when a webhook arrives with a bad signature, then it is refused and changes nothing', async () => {
    const { payment, checkoutId } = await openPayment();
    const body = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'checkout.session.completed',
      data: {
        object: {
          id: checkoutId,
          object: 'checkout.session',
          payment_status: 'paid',
          metadata: { paymentId: payment.id },
        },
      },
    });
    const res = await request(ctx.app)
      .post('/webhooks/payments')
      .set('content-type', 'application/json')
      .set('stripe-signature', signPayload(body, 'whsec_not_the_right_secret'))
      .send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_signature');
    const unsigned = await request(ctx.app)
      .post('/webhooks/payments')
      .set('content-type', 'application/json')
      .send(body);
    expect(unsigned.status).toBe(400);
    expect((await paymentRow(payment.id)).status).toBe('pending');
  });

  test('when the same webhook is delivered twice, then it is applied once: one package, the second answered as a duplicate', async () => {
    const { clientId, checkoutId } = await openPayment();
    await fakes.payments.pay(checkoutId, TEST_CARDS.success);
    const completed = fakes.payments.events.find(
      (e) => e.type === 'checkout.session.completed' && (e.data.object as { id: string }).id === checkoutId,
    )!;
    const status = await fakes.payments.redeliver(completed.id);
    expect(status).toBe(200);
    const [{ count }] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS count FROM visit_packages WHERE client_id = :clientId`,
      { replacements: { clientId }, type: 'SELECT' },
    )) as unknown as [{ count: number }];
    expect(count).toBe(1);
    const [{ events }] = (await ctx.sequelize.query(
      `SELECT count(*)::int AS events FROM payment_events WHERE event_id = :id`,
      { replacements: { id: completed.id }, type: 'SELECT' },
    )) as unknown as [{ events: number }];
    expect(events).toBe(1);
  });

  test('when the card is declined, then the payment shows as failed with the reason, and a later good card still pays it', async () => {
    const { payment, checkoutId } = await openPayment('test-visit');
    expect(await fakes.payments.pay(checkoutId, TEST_CARDS.declined)).toEqual({
      ok: false,
      message: 'Your card was declined.',
    });
    expect(await paymentRow(payment.id)).toEqual({
      status: 'failed',
      failure_reason: 'Your card was declined.',
    });
    await fakes.payments.pay(checkoutId, TEST_CARDS.success);
    expect((await paymentRow(payment.id)).status).toBe('paid');
  });

  test('when a paid package is refunded, then the payment shows refunded and its visits are no longer available', async () => {
    const { clientId, payment, checkoutId } = await openPayment();
    await fakes.payments.pay(checkoutId, TEST_CARDS.success);
    const res = await request(ctx.app)
      .post(`/api/billing/payments/${payment.id}/refund`)
      .set('authorization', `Bearer ${admin}`);
    expect(res.status).toBe(200);
    expect(res.body.payment.status).toBe('refunded');
    const after = await record(clientId);
    expect(after.packages[0]).toMatchObject({ status: 'refunded', visitsLeft: 0 });
    const again = await request(ctx.app)
      .post(`/api/billing/payments/${payment.id}/refund`)
      .set('authorization', `Bearer ${admin}`);
    expect(again.status).toBe(409);
  });

  test('when sessions are recorded for a client with a package, then the visits count down and stop at zero', async () => {
    const { clientId, checkoutId } = await openPayment('test-visit');
    await fakes.payments.pay(checkoutId, TEST_CARDS.success);
    await insertSession(ctx.sequelize, clinic.id, clientId);
    await insertSession(ctx.sequelize, clinic.id, clientId);
    const after = await record(clientId);
    expect(after.packages[0]).toMatchObject({ visitsTotal: 1, visitsUsed: 1, visitsLeft: 0 });
    expect(after.visits.filter((v: { paidFromPackage: boolean }) => v.paidFromPackage)).toHaveLength(1);
  });

  test('when a session that used a package visit is cancelled from a device, then the visit is given back, and taken again if the session is restored', async () => {
    const { clientId, checkoutId } = await openPayment('package-5');
    await fakes.payments.pay(checkoutId, TEST_CARDS.success);
    const deviceId = randomUUID();
    const sessionId = randomUUID();
    const session = (status: string) => ({
      clientId,
      status,
      startedAt: '2026-11-30T09:00:00.000Z',
      finishedAt: '2026-11-30T09:12:00.000Z',
      findings: null,
      plan: null,
      followUpDate: null,
    });
    const push = async (baseVersion: number, status: string) => {
      const res = await request(ctx.app)
        .post('/api/sync/push')
        .set('authorization', `Bearer ${operator}`)
        .send({
          protocolVersion: SYNC_PROTOCOL_VERSION,
          deviceId,
          mutations: [
            {
              mutationId: randomUUID(),
              entity: 'recording_sessions',
              id: sessionId,
              baseVersion,
              // A later change carries only what the operator changes: findings and plan are not theirs.
              change: baseVersion === 0 ? session(status) : { status },
            },
          ],
        });
      expect(res.status).toBe(200);
      expect(res.body.results[0].status).toBe('applied');
      return res.body.results[0].newVersion as number;
    };
    const v1 = await push(0, 'completed');
    expect((await record(clientId)).packages[0]).toMatchObject({ visitsTotal: 5, visitsUsed: 1 });

    const v2 = await push(v1, 'cancelled');
    const cancelled = await record(clientId);
    expect(cancelled.packages[0]).toMatchObject({ visitsUsed: 0, visitsLeft: 5 });
    expect(cancelled.visits.find((v: { sessionId: string }) => v.sessionId === sessionId)).toMatchObject({
      status: 'cancelled',
      paidFromPackage: false,
    });

    await push(v2, 'completed');
    expect((await record(clientId)).packages[0]).toMatchObject({ visitsUsed: 1, visitsLeft: 4 });
  });

  test('when an offer that the clinic does not have is asked for, then it is refused before the provider is called', async () => {
    const clientId = await insertClient(ctx.sequelize, clinic.id);
    const before = fakes.payments.events.length;
    const res = await request(ctx.app)
      .post('/api/billing/payments')
      .set('authorization', `Bearer ${admin}`)
      .send({ clientId, offerId: 'gold-plan' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('unknown_offer');
    expect(fakes.payments.events.length).toBe(before);
  });

  test('when payments are listed with a status filter, then only those come back, newest first', async () => {
    const res = await request(ctx.app)
      .get('/api/billing/payments?status=refunded')
      .set('authorization', `Bearer ${admin}`);
    expect(res.status).toBe(200);
    expect(res.body.payments.length).toBeGreaterThan(0);
    expect(res.body.payments.every((p: { status: string }) => p.status === 'refunded')).toBe(true);
  });
});
