import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { Panel } from '@/ui/panel';
import { FormTextField } from '@/ui/form-text-field';
import { erasedCountsWords } from '@/ui/result-words';
import { colors, space } from '@/ui/theme';
import type { EraseClientResponse } from '@/shared/protocol/practice';

const normalise = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

export function eraseConfirmSchema(fullName: string) {
  return z.object({
    confirmName: z
      .string()
      .trim()
      .min(1, { error: `Type “${fullName}” to confirm.` })
      .refine((typed) => normalise(typed) === normalise(fullName), {
        error: `The name does not match. Type “${fullName}” exactly as shown; nothing was erased.`,
      }),
  });
}

type Props = {
  fullName: string;
  onErase: (confirmName: string) => Promise<EraseClientResponse>;
  onDone: (result: EraseClientResponse) => void;
};

/** Erasure on request: the admin types the client's name before anything is sent. */
export function ErasePanel({ fullName, onErase, onDone }: Props) {
  const schema = useMemo(() => eraseConfirmSchema(fullName), [fullName]);
  const form = useForm<{ confirmName: string }>({
    resolver: zodResolver(schema),
    defaultValues: { confirmName: '' },
  });
  const [open, setOpen] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const submit = form.handleSubmit(async ({ confirmName }) => {
    setFailure(null);
    try {
      onDone(await onErase(confirmName));
    } catch (error) {
      setFailure(error instanceof Error ? error.message : 'The erasure failed; nothing was erased.');
    }
  });

  return (
    <Panel
      title="Erase this client"
      detail="Removes the record, consent, sessions, clips and reports. Devices drop them at their next sync. The audit log keeps that an erasure happened, not the data."
      tone="danger"
      testID="erase-panel"
    >
      {!open ? (
        <View style={styles.start}>
          <Button
            label="Erase client…"
            variant="secondary"
            onPress={() => setOpen(true)}
            testID="erase-start"
          />
        </View>
      ) : (
        <View style={styles.form}>
          <AppText variant="small" color={colors.text}>
            This cannot be undone. To confirm, type the client&apos;s full name:{' '}
            <AppText variant="smallStrong" color={colors.ink}>
              {fullName}
            </AppText>
          </AppText>
          <FormTextField
            control={form.control}
            name="confirmName"
            label="Client's full name"
            testID="erase-confirm-name"
            autoCapitalize="words"
            autoCorrect={false}
          />
          <View style={styles.buttons}>
            <Button
              label="Erase permanently"
              variant="danger"
              onPress={() => void submit()}
              busy={form.formState.isSubmitting}
              testID="erase-submit"
            />
            <Button
              label="Cancel"
              variant="ghost"
              onPress={() => {
                form.reset();
                setFailure(null);
                setOpen(false);
              }}
              testID="erase-cancel"
            />
          </View>
          {failure ? (
            <AppText color={colors.danger} testID="erase-error" accessibilityRole="alert">
              {failure}
            </AppText>
          ) : null}
        </View>
      )}
    </Panel>
  );
}

/** What the erasure did, shown in place of the record that is gone. */
export function ErasureResult({ result, onBack }: { result: EraseClientResponse; onBack: () => void }) {
  return (
    <Panel title="What was erased" testID="erase-result">
      <AppText color={colors.text} testID="erase-result-counts">
        {`Erased ${result.clientName}: ${erasedCountsWords(result.erased)}.`}
      </AppText>
      <AppText variant="small" color={colors.textMuted}>
        Phones and tablets drop the client the next time they connect. The audit log keeps that you erased a
        client, and when, but not who they were.
      </AppText>
      <View style={styles.start}>
        <Button label="Back to clients" variant="secondary" onPress={onBack} testID="erase-result-back" />
      </View>
    </Panel>
  );
}

const styles = StyleSheet.create({
  start: { flexDirection: 'row' },
  form: { gap: space.md, maxWidth: 520 },
  buttons: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
