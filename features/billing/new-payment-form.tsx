import { zodResolver } from '@hookform/resolvers/zod';
import * as Linking from 'expo-linking';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { ChoiceChips } from '@/ui/choice-chips';
import { Panel } from '@/ui/panel';
import { SearchField } from '@/ui/search-field';
import { colors, radii, space } from '@/ui/theme';
import { useCreatePaymentMutation } from './api';
import { useClientTableQuery } from '@/features/client-records/api';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import {
  createPaymentRequestSchema,
  type CreatePaymentRequest,
  type Offer,
} from '@/shared/protocol/practice';
import { formatMoney } from './money';

type Picked = { id: string; name: string; email: string | null };

function ClientPicker({
  value,
  onPick,
  error,
}: {
  value: Picked | null;
  onPick: (client: Picked | null) => void;
  error?: string;
}) {
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search.trim());
  const found = useClientTableQuery({ page: 1, pageSize: 6, q: q || undefined, sort: 'name', dir: 'asc' });
  if (value) {
    return (
      <View style={styles.picked} testID="payment-client-picked">
        <View style={styles.grow}>
          <AppText variant="bodyStrong" color={colors.ink}>
            {value.name}
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            {value.email ?? 'No e-mail on file: the link is shown here only.'}
          </AppText>
        </View>
        <Button label="Change" variant="ghost" onPress={() => onPick(null)} testID="payment-client-change" />
      </View>
    );
  }
  return (
    <View style={styles.picker}>
      <AppText variant="smallStrong" color={colors.ink}>
        Client
      </AppText>
      <SearchField
        value={search}
        onChangeText={setSearch}
        placeholder="Find the client by name or e-mail"
        label="Find the client"
        testID="payment-client-search"
      />
      <View style={styles.results}>
        {found.isError ? (
          <AppText variant="small" color={colors.danger}>
            {found.error.message}
          </AppText>
        ) : (
          (found.data?.clients ?? []).map((c) => (
            <Pressable
              key={c.id}
              onPress={() => onPick({ id: c.id, name: `${c.firstName} ${c.lastName}`, email: c.email })}
              style={({ pressed }) => [styles.result, pressed && styles.resultPressed]}
              accessibilityRole="button"
              testID={`payment-client-option-${c.id}`}
            >
              <AppText variant="smallStrong" color={colors.ink}>
                {c.firstName} {c.lastName}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                {c.email ?? 'no e-mail'}
              </AppText>
            </Pressable>
          ))
        )}
        {found.data && found.data.clients.length === 0 ? (
          <AppText variant="small" color={colors.textMuted}>
            No client matches.
          </AppText>
        ) : null}
      </View>
      {error ? (
        <AppText
          variant="small"
          color={colors.danger}
          testID="payment-client-error"
          accessibilityRole="alert"
        >
          {error}
        </AppText>
      ) : null}
    </View>
  );
}

/** Asks the provider for a hosted payment page; the client pays there, never here. */
export function NewPaymentForm({ offers, currency }: { offers: Offer[]; currency: string }) {
  const create = useCreatePaymentMutation();
  const [picked, setPicked] = useState<Picked | null>(null);
  const form = useForm<CreatePaymentRequest>({
    resolver: zodResolver(createPaymentRequestSchema),
    defaultValues: { clientId: '', offerId: offers[0]?.id ?? '', sendEmail: true },
  });
  const submit = form.handleSubmit((values) => create.mutate(values));

  return (
    <Panel
      title="Take a payment"
      detail="For a test visit or a package of visits. The client pays by card on the provider's page; no card number reaches Fourpoint."
      testID="new-payment"
    >
      <Controller
        control={form.control}
        name="clientId"
        render={({ fieldState }) => (
          <ClientPicker
            value={picked}
            onPick={(c) => {
              setPicked(c);
              form.setValue('clientId', c?.id ?? '', { shouldValidate: Boolean(c) });
              create.reset();
            }}
            error={fieldState.error ? 'Pick a client.' : undefined}
          />
        )}
      />
      <Controller
        control={form.control}
        name="offerId"
        render={({ field, fieldState }) => (
          <View style={styles.picker}>
            <AppText variant="smallStrong" color={colors.ink}>
              What is paid for
            </AppText>
            {offers.length === 0 ? (
              <AppText variant="small" color={colors.caution}>
                No offers are set up for this clinic.
              </AppText>
            ) : (
              <ChoiceChips
                label="What is paid for"
                testID="payment-offer"
                value={field.value}
                onChange={field.onChange}
                choices={offers.map((o) => ({
                  value: o.id,
                  label: `${o.label} · ${formatMoney(o.amountCents, currency)}`,
                }))}
              />
            )}
            {fieldState.error ? (
              <AppText variant="small" color={colors.danger} testID="payment-offer-error">
                {fieldState.error.message}
              </AppText>
            ) : null}
          </View>
        )}
      />
      <Controller
        control={form.control}
        name="sendEmail"
        render={({ field }) => (
          <Pressable
            onPress={() => field.onChange(!field.value)}
            accessibilityRole="checkbox"
            accessibilityState={{ checked: Boolean(field.value) }}
            style={styles.check}
            testID="payment-send-email"
          >
            <View style={[styles.box, field.value ? styles.boxOn : null]} />
            <AppText variant="small" color={colors.text}>
              E-mail the payment link to the client
            </AppText>
          </Pressable>
        )}
      />
      <View style={styles.actions}>
        <Button
          label="Create payment page"
          onPress={() => void submit()}
          busy={create.isPending}
          testID="payment-create"
        />
      </View>
      {create.isError ? (
        <AppText color={colors.danger} testID="payment-create-error">
          {create.error.message}
        </AppText>
      ) : null}
      {create.isSuccess ? (
        <View style={styles.done} testID="payment-created">
          <AppText variant="bodyStrong" color={colors.ink}>
            Payment page ready: {create.data.payment.description},{' '}
            {formatMoney(create.data.payment.amountCents, create.data.payment.currency)}
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            {create.data.emailed
              ? 'The link was e-mailed to the client. It shows as paid here once the provider confirms.'
              : 'Not e-mailed. Open the page on this device for the client, or send the link yourself.'}
          </AppText>
          {create.data.payment.checkoutUrl ? (
            <>
              <AppText variant="number" color={colors.text} selectable testID="payment-checkout-url">
                {create.data.payment.checkoutUrl}
              </AppText>
              <View style={styles.actions}>
                <Button
                  label="Open payment page"
                  variant="secondary"
                  onPress={() => void Linking.openURL(create.data.payment.checkoutUrl!)}
                  testID="payment-open"
                />
              </View>
            </>
          ) : null}
        </View>
      ) : null}
    </Panel>
  );
}

const styles = StyleSheet.create({
  grow: { flex: 1, minWidth: 0 },
  picker: { gap: space.sm },
  picked: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    padding: space.md,
    borderRadius: radii.md,
    backgroundColor: colors.paper,
  },
  results: { gap: 2, maxWidth: 520 },
  result: { paddingVertical: space.sm, paddingHorizontal: space.md, borderRadius: radii.sm },
  resultPressed: { backgroundColor: colors.surfaceMuted },
  check: { flexDirection: 'row', alignItems: 'center', gap: space.sm, alignSelf: 'flex-start' },
  box: { width: 20, height: 20, borderRadius: 4, borderWidth: 2, borderColor: colors.ink },
  boxOn: { backgroundColor: colors.ink },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  done: { gap: space.sm, padding: space.md, borderRadius: radii.md, backgroundColor: colors.pulseSoft },
});
