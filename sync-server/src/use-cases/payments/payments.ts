import { randomUUID } from 'node:crypto';
import type {
  CreatePaymentRequest,
  CreatePaymentResponse,
  Payment,
  PaymentListResponse,
  PaymentStatus,
} from '@/shared/protocol/practice';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import { findClientRow } from '../../repositories/clients-repository';
import { iso } from '../../repositories/sql';
import * as repo from '../../repositories/payments-repository';
import type { Caller, UseCaseDeps } from '../context';
import { getSettings } from '../settings/settings';

export const WEBHOOK_PATH = '/webhooks/payments';
export const RETURN_PATH = '/payments/complete';

const money = (cents: number, currency: string) =>
  new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() }).format(cents / 100);

export const toPayment = (p: repo.PaymentRow): Payment => ({
  id: p.id,
  clientId: p.client_id,
  clientName: p.client_name,
  description: p.description,
  visits: p.visits,
  amountCents: p.amount_cents,
  currency: p.currency,
  status: p.status,
  checkoutUrl: p.status === 'pending' || p.status === 'failed' ? p.checkout_url : null,
  failureReason: p.failure_reason,
  createdAt: iso(p.created_at)!,
  paidAt: iso(p.paid_at),
  refundedAt: iso(p.refunded_at),
});

export async function listPayments(
  deps: UseCaseDeps,
  caller: Caller,
  query: { page: number; pageSize: number; status?: PaymentStatus; q?: string },
): Promise<PaymentListResponse> {
  const [{ rows, total }, settings] = await Promise.all([
    repo.pagePayments(deps.sequelize, caller.clinicId, query),
    getSettings(deps, caller.clinicId),
  ]);
  return {
    payments: rows.map(toPayment),
    pageInfo: { page: query.page, pageSize: query.pageSize, total },
    offers: settings.offers,
    currency: settings.currency,
  };
}

/** Opens a payment page at the provider for one offer; the card is typed there, never here. */
export async function createPayment(
  deps: UseCaseDeps,
  caller: Caller,
  input: CreatePaymentRequest,
  base: string,
): Promise<CreatePaymentResponse> {
  const client = await findClientRow(deps.sequelize, caller.clinicId, input.clientId);
  if (!client) throw new AppError('not_found', 'There is no such client in this clinic.', 404);
  const settings = await getSettings(deps, caller.clinicId);
  const offer = settings.offers.find((o) => o.id === input.offerId);
  if (!offer)
    throw new AppError('unknown_offer', 'This clinic does not offer that; pick one from the list.', 400);
  const practice = deps.services;
  const id = randomUUID();
  await deps.sequelize.transaction(async (transaction) => {
    await repo.insertPayment(
      deps.sequelize,
      {
        id,
        clinicId: caller.clinicId,
        clientId: client.id,
        offerId: offer.id,
        description: offer.label,
        visits: offer.visits,
        amountCents: offer.amountCents,
        currency: settings.currency,
        createdBy: caller.userId,
      },
      transaction,
    );
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'payment.create',
        entity: 'payment',
        entityId: id,
        ip: caller.ip,
        details: { clientId: client.id, offerId: offer.id, amountCents: offer.amountCents },
      },
      transaction,
    );
  });
  if (practice.registerWebhook) await practice.payments.registerWebhook(`${base}${WEBHOOK_PATH}`);
  const checkout = await practice.payments.createCheckout({
    amountCents: offer.amountCents,
    currency: settings.currency,
    description: `${offer.label} at ${settings.name}`,
    reference: id,
    customerEmail: client.email,
    metadata: { paymentId: id, clinicId: caller.clinicId },
    successUrl: `${base}${RETURN_PATH}?session_id={CHECKOUT_SESSION_ID}`,
    cancelUrl: `${base}${RETURN_PATH}?cancelled=1`,
  });
  await repo.setCheckout(deps.sequelize, id, checkout.checkoutId, checkout.url);
  let emailed = false;
  if ((input.sendEmail ?? true) && client.email) {
    try {
      await practice.mail.send({
        clinicId: caller.clinicId,
        to: client.email,
        subject: `Payment for your ${offer.label.toLowerCase()} at ${settings.name}`,
        text: [
          `Hello ${client.first_name},`,
          '',
          `${settings.name} asks for ${money(offer.amountCents, settings.currency)} for: ${offer.label}.`,
          'You can pay by card on this secure page:',
          checkout.url,
          '',
          'No account is needed. If you have questions, reply to the clinic directly.',
        ].join('\n'),
      });
      emailed = true;
    } catch {
      emailed = false;
    }
  }
  return { payment: toPayment((await repo.findPayment(deps.sequelize, caller.clinicId, id))!), emailed };
}

export type WebhookOutcome = { received: true; duplicate: boolean; applied: string };

/** Applies one provider event exactly once; a repeated delivery is acknowledged and changes nothing. */
export async function handlePaymentWebhook(
  deps: UseCaseDeps,
  rawBody: Buffer,
  signature: string | undefined,
): Promise<WebhookOutcome> {
  const event = deps.services.payments.parseWebhook(rawBody, signature);
  return deps.sequelize.transaction(async (transaction) => {
    const fresh = await repo.claimEvent(deps.sequelize, event.eventId, event.kind, transaction);
    if (!fresh) return { received: true, duplicate: true, applied: 'none' };
    if (event.kind === 'ignored') return { received: true, duplicate: false, applied: 'none' };
    const payment = await repo.lockPaymentFor(
      deps.sequelize,
      {
        paymentId: 'metadata' in event ? event.metadata.paymentId : null,
        checkoutId: 'checkoutId' in event ? event.checkoutId : null,
        paymentIntentId: 'paymentIntentId' in event ? event.paymentIntentId : null,
      },
      transaction,
    );
    if (!payment) return { received: true, duplicate: false, applied: 'unknown_payment' };
    await repo.linkEvent(deps.sequelize, event.eventId, payment.id, transaction);
    const audit = (action: string, details?: Record<string, unknown>) =>
      recordAuditEvent(
        {
          clinicId: payment.clinic_id,
          userId: null,
          action,
          entity: 'payment',
          entityId: payment.id,
          details: { ...details, providerEvent: event.eventId },
        },
        transaction,
      );
    switch (event.kind) {
      case 'paid':
        if (payment.status === 'paid' || payment.status === 'refunded')
          return { received: true, duplicate: false, applied: 'none' };
        await repo.markPaid(deps.sequelize, payment.id, event.paymentIntentId, transaction);
        await repo.createPackage(deps.sequelize, payment, randomUUID(), transaction);
        await audit('payment.paid', { amountCents: payment.amount_cents });
        return { received: true, duplicate: false, applied: 'paid' };
      case 'failed':
        if (payment.status !== 'pending' && payment.status !== 'failed')
          return { received: true, duplicate: false, applied: 'none' };
        await repo.markStatus(
          deps.sequelize,
          payment.id,
          'failed',
          { failureReason: event.reason, paymentIntentId: event.paymentIntentId },
          transaction,
        );
        await audit('payment.failed');
        return { received: true, duplicate: false, applied: 'failed' };
      case 'refunded':
        if (!event.fullyRefunded || payment.status !== 'paid')
          return { received: true, duplicate: false, applied: 'none' };
        await repo.markStatus(deps.sequelize, payment.id, 'refunded', {}, transaction);
        await repo.refundPackage(deps.sequelize, payment.id, transaction);
        await audit('payment.refunded', { amountCents: event.amountRefunded });
        return { received: true, duplicate: false, applied: 'refunded' };
      case 'expired':
        if (payment.status !== 'pending') return { received: true, duplicate: false, applied: 'none' };
        await repo.markStatus(deps.sequelize, payment.id, 'expired', {}, transaction);
        return { received: true, duplicate: false, applied: 'expired' };
    }
  });
}

export async function refundPayment(deps: UseCaseDeps, caller: Caller, paymentId: string): Promise<Payment> {
  const payment = await repo.findPayment(deps.sequelize, caller.clinicId, paymentId);
  if (!payment) throw new AppError('not_found', 'There is no such payment.', 404);
  if (payment.status !== 'paid' || !payment.payment_intent_id) {
    throw new AppError(
      'not_refundable',
      `Only a paid payment can be refunded; this one is ${payment.status}.`,
      409,
    );
  }
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'payment.refund_requested',
    entity: 'payment',
    entityId: paymentId,
    ip: caller.ip,
  });
  // The provider confirms with a webhook; the status changes when it arrives.
  await deps.services.payments.refund(payment.payment_intent_id, `refund-${payment.id}`);
  return toPayment((await repo.findPayment(deps.sequelize, caller.clinicId, paymentId))!);
}

export async function paymentStatusForReturnPage(
  deps: UseCaseDeps,
  checkoutId: string,
): Promise<PaymentStatus | null> {
  const payment = await repo.findPaymentByCheckout(deps.sequelize, checkoutId);
  return payment?.status ?? null;
}
