import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { AskFirst } from '@/ui/confirm-step';
import { ChoiceChips } from '@/ui/choice-chips';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate, formatTime } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { SearchField } from '@/ui/search-field';
import { PagedQueryView } from '@/ui/state-views';
import { paymentStatusWords } from '@/ui/status-words';
import { colors, space } from '@/ui/theme';
import { usePaymentsQuery, useRefundMutation } from './api';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import { useLayout } from '@/ui/use-layout';
import type { Payment, PaymentStatus } from '@/shared/protocol/practice';
import { formatMoney } from './money';
import { NewPaymentForm } from './new-payment-form';

const pageSize = 20;
type StatusFilter = PaymentStatus | 'all';
const filters: { value: StatusFilter; label: string }[] = [
  { value: 'all', label: 'All' },
  ...(['pending', 'paid', 'failed', 'refunded'] as const).map((value) => ({
    value,
    label: paymentStatusWords[value].label,
  })),
  { value: 'expired', label: paymentStatusWords.expired.label },
];

function RefundAction({ payment }: { payment: Payment }) {
  const refund = useRefundMutation();
  if (payment.status !== 'paid') return null;
  return (
    <AskFirst
      label="Refund…"
      testID={`payment-refund-${payment.id}`}
      question={`Refund ${formatMoney(payment.amountCents, payment.currency)}?`}
      confirmLabel="Yes, refund"
      cancelLabel="No"
      tone="danger"
      busy={refund.isPending}
      error={refund.error?.message}
      onConfirm={() => refund.mutateAsync(payment.id)}
    >
      The amount goes back to the client through the payment provider.
    </AskFirst>
  );
}

const columns: readonly Column<Payment>[] = [
  {
    key: 'created',
    title: 'Created',
    render: (p) => (
      <Cell>
        {formatDate(p.createdAt)} {formatTime(p.createdAt)}
      </Cell>
    ),
  },
  {
    key: 'client',
    title: 'Client',
    flex: 1.3,
    render: (p) => <Cell strong>{p.clientName ?? 'erased client'}</Cell>,
  },
  {
    key: 'what',
    title: 'For',
    flex: 1.4,
    render: (p) => (
      <Cell>
        {p.description} ({p.visits} {p.visits === 1 ? 'visit' : 'visits'})
      </Cell>
    ),
  },
  {
    key: 'amount',
    title: 'Amount',
    render: (p) => <Cell figures>{formatMoney(p.amountCents, p.currency)}</Cell>,
  },
  {
    key: 'status',
    title: 'State',
    render: (p) => (
      <View style={styles.status}>
        <Badge {...paymentStatusWords[p.status]} testID={`payment-status-${p.id}`} />
        {p.status === 'failed' && p.failureReason ? (
          <AppText variant="caption" color={colors.danger} numberOfLines={2}>
            {p.failureReason}
          </AppText>
        ) : null}
        {p.status === 'paid' && p.paidAt ? (
          <AppText variant="caption" color={colors.textMuted}>
            paid {formatDate(p.paidAt)}
          </AppText>
        ) : null}
        {p.status === 'refunded' && p.refundedAt ? (
          <AppText variant="caption" color={colors.textMuted}>
            refunded {formatDate(p.refundedAt)}
          </AppText>
        ) : null}
      </View>
    ),
  },
  { key: 'action', title: '', flex: 1.2, render: (p) => <RefundAction payment={p} /> },
];

/** Payments for test visits and packages, their state as the provider reports it, refunds. */
export function BillingScreen() {
  const { isWide } = useLayout();
  const [status, setStatus] = useState<StatusFilter>('all');
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search.trim());
  const [page, setPage] = useState(1);
  const payments = usePaymentsQuery({
    page,
    pageSize,
    status: status === 'all' ? undefined : status,
    q: q || undefined,
  });

  const list = (
    <PagedQueryView
      query={payments}
      loading="Loading payments…"
      testID="payments"
      empty={{
        when: (data) => data.payments.length === 0,
        ...(status === 'all' && !q
          ? { title: 'No payments yet', detail: 'Payments you create appear here with their state.' }
          : { title: 'No payment matches', detail: 'Change the filter or the search.' }),
      }}
      onPage={setPage}
    >
      {(data) => (
        <DataTable
          rows={data.payments}
          columns={columns}
          rowKey={(p) => p.id}
          rowTestID={(p) => `payment-row-${p.id}`}
          wide={isWide}
          testID="payments-table"
        />
      )}
    </PagedQueryView>
  );

  return (
    <ScreenFrame
      title="Billing"
      subtitle="Test visits and packages of visits, paid by card on the provider's page."
      testID="billing-screen"
    >
      {payments.data ? (
        <NewPaymentForm offers={payments.data.offers} currency={payments.data.currency} />
      ) : null}
      <View style={styles.filters}>
        <ChoiceChips
          label="Payment state"
          testID="payments-filter"
          value={status}
          onChange={(s) => {
            setStatus(s);
            setPage(1);
          }}
          choices={filters}
        />
        <SearchField
          value={search}
          onChangeText={(t) => {
            setSearch(t);
            setPage(1);
          }}
          placeholder="Search by client or description"
          label="Search payments"
          testID="payments-search"
        />
      </View>
      {list}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  filters: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  status: { gap: 2 },
  confirm: { gap: space.xs },
  confirmButtons: { flexDirection: 'row', gap: space.xs, flexWrap: 'wrap' },
});
