import express from 'express';
import { z } from 'zod';
import { createPaymentRequestSchema, paymentListQuerySchema } from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import * as payments from '../use-cases/payments/payments';
import type { HandlerFactory } from './handlers';
import { linkBase } from './request-origin';
import { rowId } from './row-ids';

export const listPayments: HandlerFactory = (deps) => async (req, res) => {
  res.json(await payments.listPayments(deps, callerOf(req), paymentListQuerySchema.parse(req.query)));
};

export const createPayment: HandlerFactory = (deps) => async (req, res) => {
  res
    .status(201)
    .json(
      await payments.createPayment(
        deps,
        callerOf(req),
        createPaymentRequestSchema.parse(req.body),
        linkBase(deps.services, req),
      ),
    );
};

export const refundPayment: HandlerFactory = (deps) => async (req, res) => {
  res.json({ payment: await payments.refundPayment(deps, callerOf(req), rowId(req)) });
};

// Outside /api, so the JSON parser leaves the exact bytes the signature covers.
const rawBody = express.raw({ type: '*/*', limit: '1mb' });
export const paymentWebhook: HandlerFactory = (deps) => (req, res, next) => {
  rawBody(req, res, (error?: unknown) => {
    if (error) return next(error);
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    payments
      .handlePaymentWebhook(deps, body, req.get('stripe-signature'))
      .then((outcome) => res.json(outcome))
      .catch(next);
  });
};

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** Where the provider sends the payer back: a plain page, since the payer has no account. */
export const paymentReturnPage: HandlerFactory = (deps) => async (req, res) => {
  const query = z
    .object({ session_id: z.string().max(200).optional(), cancelled: z.string().optional() })
    .parse(req.query);
  const status = query.session_id ? await payments.paymentStatusForReturnPage(deps, query.session_id) : null;
  const [title, line] = query.cancelled
    ? ['Payment cancelled', 'Nothing was charged. You can use the link in your e-mail again at any time.']
    : status === 'paid'
      ? ['Thank you, your payment is received', 'The clinic has been told. You can close this page.']
      : [
          'Your payment is being confirmed',
          'This can take a moment; the clinic will see it as soon as it is confirmed.',
        ];
  res
    .type('html')
    .send(
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>${escapeHtml(title)}</title>` +
        `<style>body{font-family:system-ui,sans-serif;background:#f6f2ea;color:#12343b;margin:0}main{max-width:460px;margin:64px auto;padding:28px;background:#fff;border-radius:12px}</style></head>` +
        `<body><main><h1 data-testid="payment-return-title">${escapeHtml(title)}</h1><p>${escapeHtml(line)}</p></main></body></html>`,
    );
};
