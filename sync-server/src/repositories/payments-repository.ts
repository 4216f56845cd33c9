import type { Sequelize, Transaction } from 'sequelize';
import type { PaymentStatus } from '@/shared/protocol/practice';
import { escapeLike, execute, selectRows } from './sql';

export type PaymentRow = {
  id: string;
  clinic_id: string;
  client_id: string | null;
  client_name: string | null;
  description: string;
  visits: number;
  amount_cents: number;
  currency: string;
  status: PaymentStatus;
  checkout_id: string | null;
  checkout_url: string | null;
  payment_intent_id: string | null;
  failure_reason: string | null;
  created_at: Date;
  paid_at: Date | null;
  refunded_at: Date | null;
};

const SELECT = `SELECT p.*, CASE WHEN c.id IS NULL THEN NULL ELSE concat_ws(' ', c.first_name, c.last_name) END AS client_name
  FROM payments p LEFT JOIN clients c ON c.id = p.client_id AND c.deleted_at IS NULL`;

export async function insertPayment(
  sequelize: Sequelize,
  row: {
    id: string;
    clinicId: string;
    clientId: string;
    offerId: string;
    description: string;
    visits: number;
    amountCents: number;
    currency: string;
    createdBy: string;
  },
  transaction?: Transaction,
) {
  await execute(
    sequelize,
    `INSERT INTO payments (id, clinic_id, client_id, offer_id, description, visits, amount_cents, currency, created_by)
     VALUES (:id, :clinicId, :clientId, :offerId, :description, :visits, :amountCents, :currency, :createdBy)`,
    row,
    transaction,
  );
}

export const setCheckout = (sequelize: Sequelize, id: string, checkoutId: string, url: string) =>
  execute(
    sequelize,
    `UPDATE payments SET checkout_id = :checkoutId, checkout_url = :url, updated_at = now() WHERE id = :id`,
    { id, checkoutId, url },
  );

export async function findPayment(sequelize: Sequelize, clinicId: string, id: string) {
  const rows = await selectRows<PaymentRow>(
    sequelize,
    `${SELECT} WHERE p.clinic_id = :clinicId AND p.id = :id`,
    { clinicId, id },
  );
  return rows[0] ?? null;
}

export async function findPaymentByCheckout(sequelize: Sequelize, checkoutId: string) {
  const rows = await selectRows<PaymentRow>(sequelize, `${SELECT} WHERE p.checkout_id = :checkoutId`, {
    checkoutId,
  });
  return rows[0] ?? null;
}

/** Locks the payment a provider event is about, found by whichever id the event carries. */
export async function lockPaymentFor(
  sequelize: Sequelize,
  ids: { paymentId?: string | null; checkoutId?: string | null; paymentIntentId?: string | null },
  transaction: Transaction,
) {
  const paymentId = ids.paymentId && /^[0-9a-f-]{36}$/.test(ids.paymentId) ? ids.paymentId : null;
  const rows = await selectRows<PaymentRow>(
    sequelize,
    `SELECT * FROM payments WHERE (id = :paymentId::uuid OR checkout_id = :checkoutId OR payment_intent_id = :paymentIntentId)
     ORDER BY created_at LIMIT 1 FOR UPDATE`,
    { paymentId, checkoutId: ids.checkoutId ?? null, paymentIntentId: ids.paymentIntentId ?? null },
    transaction,
  );
  return rows[0] ?? null;
}

/** True when the event is new; false when it was applied before (the provider delivers at least once). */
export async function claimEvent(
  sequelize: Sequelize,
  eventId: string,
  type: string,
  transaction: Transaction,
): Promise<boolean> {
  const rows = await selectRows(
    sequelize,
    `INSERT INTO payment_events (event_id, type) VALUES (:eventId, :type) ON CONFLICT (event_id) DO NOTHING RETURNING event_id`,
    { eventId, type },
    transaction,
  );
  return rows.length === 1;
}

export const linkEvent = (
  sequelize: Sequelize,
  eventId: string,
  paymentId: string,
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE payment_events SET payment_id = :paymentId WHERE event_id = :eventId`,
    { eventId, paymentId },
    transaction,
  );

export const markPaid = (
  sequelize: Sequelize,
  id: string,
  paymentIntentId: string | null,
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE payments SET status = 'paid', paid_at = now(), payment_intent_id = coalesce(:paymentIntentId, payment_intent_id),
       failure_reason = NULL, updated_at = now() WHERE id = :id`,
    { id, paymentIntentId },
    transaction,
  );

export const markStatus = (
  sequelize: Sequelize,
  id: string,
  status: PaymentStatus,
  extra: { failureReason?: string; paymentIntentId?: string },
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `UPDATE payments SET status = :status, failure_reason = coalesce(:failureReason, failure_reason),
       payment_intent_id = coalesce(:paymentIntentId, payment_intent_id),
       refunded_at = CASE WHEN :status = 'refunded' THEN now() ELSE refunded_at END, updated_at = now() WHERE id = :id`,
    {
      id,
      status,
      failureReason: extra.failureReason ?? null,
      paymentIntentId: extra.paymentIntentId ?? null,
    },
    transaction,
  );

export const createPackage = (
  sequelize: Sequelize,
  payment: PaymentRow,
  id: string,
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `INSERT INTO visit_packages (id, clinic_id, client_id, payment_id, description, visits_total)
     SELECT :id, :clinicId, :clientId, :paymentId, :description, :visits WHERE :clientId::uuid IS NOT NULL
     ON CONFLICT (payment_id) DO NOTHING`,
    {
      id,
      clinicId: payment.clinic_id,
      clientId: payment.client_id,
      paymentId: payment.id,
      description: payment.description,
      visits: payment.visits,
    },
    transaction,
  );

export const refundPackage = (sequelize: Sequelize, paymentId: string, transaction: Transaction) =>
  execute(
    sequelize,
    `UPDATE visit_packages SET status = 'refunded', updated_at = now() WHERE payment_id = :paymentId`,
    { paymentId },
    transaction,
  );

export async function pagePayments(
  sequelize: Sequelize,
  clinicId: string,
  query: { page: number; pageSize: number; status?: PaymentStatus; q?: string },
) {
  const where = `p.clinic_id = :clinicId AND (:status::text IS NULL OR p.status = :status)
    AND (:search::text IS NULL OR concat_ws(' ', c.first_name, c.last_name) ILIKE :search OR p.description ILIKE :search)`;
  const replacements = {
    clinicId,
    status: query.status ?? null,
    search: query.q ? `%${escapeLike(query.q)}%` : null,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  };
  const [rows, counts] = await Promise.all([
    selectRows<PaymentRow>(
      sequelize,
      `${SELECT} WHERE ${where} ORDER BY p.created_at DESC, p.id LIMIT :limit OFFSET :offset`,
      replacements,
    ),
    selectRows<{ total: string }>(
      sequelize,
      `SELECT count(*) AS total FROM payments p LEFT JOIN clients c ON c.id = p.client_id WHERE ${where}`,
      replacements,
    ),
  ]);
  return { rows, total: Number(counts[0]?.total ?? 0) };
}
