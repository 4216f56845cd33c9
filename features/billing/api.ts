import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import {
  createPaymentResponseSchema,
  paymentListResponseSchema,
  paymentSchema,
  type CreatePaymentRequest,
  type PaymentStatus,
} from '@/shared/protocol/practice';

export const billingKey = ['billing'] as const;

export function usePaymentsQuery(query: {
  page: number;
  pageSize: number;
  status?: PaymentStatus;
  q?: string;
}) {
  return useQuery({
    queryKey: [...billingKey, query],
    placeholderData: keepPreviousData,
    refetchInterval: 5000,
    queryFn: async () =>
      unwrap(
        await request({ method: 'GET', url: '/billing/payments', params: query }, paymentListResponseSchema),
      ),
  });
}

export function useCreatePaymentMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: CreatePaymentRequest) =>
      unwrap(
        await request({ method: 'POST', url: '/billing/payments', data: input }, createPaymentResponseSchema),
      ),
    onSuccess: () => qc.invalidateQueries({ queryKey: billingKey }),
  });
}

export function useRefundMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (id: string) =>
      unwrap(
        await request(
          { method: 'POST', url: `/billing/payments/${id}/refund` },
          z.object({ payment: paymentSchema }),
        ),
      ).payment,
    onSuccess: () => qc.invalidateQueries({ queryKey: billingKey }),
  });
}
