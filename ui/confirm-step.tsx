import { useState, type ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from './app-text';
import { Button } from './button';
import { colors, radii, space } from './theme';

type Props = {
  /** The question, naming what happens: "Publish this wording?" */
  question: string;
  /** What follows, in the practice's words. */
  children: ReactNode;
  confirmLabel: string;
  cancelLabel: string;
  /** Danger only for what cannot be undone. */
  tone?: 'primary' | 'danger';
  busy?: boolean;
  error?: string | null;
  onConfirm: () => void;
  onCancel: () => void;
  testID: string;
};

/** The second step of an action with consequences: says what follows, then asks once more. */
export function ConfirmStep({
  question,
  children,
  confirmLabel,
  cancelLabel,
  tone = 'primary',
  busy,
  error,
  onConfirm,
  onCancel,
  testID,
}: Props) {
  return (
    <View style={styles.box} testID={testID} accessibilityRole="alert">
      <AppText variant="smallStrong" color={colors.ink}>
        {question}
      </AppText>
      {typeof children === 'string' ? (
        <AppText variant="small" color={colors.text}>
          {children}
        </AppText>
      ) : (
        children
      )}
      {error ? (
        <AppText variant="small" color={colors.danger} testID={`${testID}-error`}>
          {error}
        </AppText>
      ) : null}
      <View style={styles.row}>
        <Button
          label={confirmLabel}
          variant={tone}
          busy={busy}
          onPress={onConfirm}
          testID={`${testID}-yes`}
        />
        <Button label={cancelLabel} variant="secondary" onPress={onCancel} testID={`${testID}-no`} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: {
    gap: space.sm,
    padding: space.md,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.cautionLine,
    backgroundColor: colors.cautionSoft,
  },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});

type AskFirstProps = Omit<Props, 'onCancel' | 'onConfirm' | 'testID'> & {
  /** The button that asks: "Refund…". */
  label: string;
  variant?: 'secondary' | 'ghost';
  /** The button's test id; the step's is `${testID}-confirm` (`-confirm-yes`, `-confirm-no`, `-confirm-error`). */
  testID: string;
  /** The action; the step closes once a returned promise resolves, and stays (with `error`) when it fails. */
  onConfirm: () => unknown;
};

/** A button whose action has consequences: pressed, it gives its place to the ConfirmStep that asks once more. */
export function AskFirst({ label, variant = 'secondary', testID, onConfirm, ...step }: AskFirstProps) {
  const [asking, setAsking] = useState(false);
  if (!asking)
    return <Button label={label} variant={variant} onPress={() => setAsking(true)} testID={testID} />;
  return (
    <ConfirmStep
      {...step}
      testID={`${testID}-confirm`}
      onCancel={() => setAsking(false)}
      onConfirm={() => {
        const done = onConfirm();
        if (done instanceof Promise)
          done.then(
            () => setAsking(false),
            () => undefined,
          );
      }}
    />
  );
}
