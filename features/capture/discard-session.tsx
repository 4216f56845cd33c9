import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { colors, radii, space } from '@/ui/theme';

type Props = { clientName: string; busy: boolean; error: string | null; onDiscard: () => void };

/** Leaves an unfinished session without keeping it, after saying what that deletes. */
export function DiscardSession({ clientName, busy, error, onDiscard }: Props) {
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <Button
        label="Discard this session…"
        variant="ghost"
        onPress={() => setAsking(true)}
        testID="discard-session"
      />
    );
  }
  return (
    <View style={styles.box} testID="discard-confirm" accessibilityRole="alert">
      <AppText variant="smallStrong" color={colors.ink}>
        Discard the session{clientName ? ` for ${clientName}` : ''}?
      </AppText>
      <AppText variant="small" color={colors.text}>
        The takes recorded so far are deleted from this device. Nothing has been sent to the clinic yet, so
        nothing else changes; consent stays on file.
      </AppText>
      {error ? (
        <AppText variant="small" color={colors.danger} testID="discard-error">
          {error}
        </AppText>
      ) : null}
      <View style={styles.row}>
        <Button
          label="Discard"
          variant="danger"
          busy={busy}
          onPress={onDiscard}
          testID="discard-session-confirm"
        />
        <Button
          label="Keep recording"
          variant="secondary"
          onPress={() => setAsking(false)}
          testID="discard-session-cancel"
        />
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
    borderColor: colors.line,
    backgroundColor: colors.surfaceMuted,
  },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
