import { useState } from 'react';
import { StyleSheet, TextInput, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { colors, fonts, radii, space } from '@/ui/theme';

export const skipReasons = [
  'Client declined this site',
  'Site not reachable (dressing, device, posture)',
  'Sensor problem',
] as const;

/** Skipping needs a reason, picked or typed, so the practitioner knows why a site is missing. */
export function SkipSiteForm({
  onSkip,
  onCancel,
  busy,
}: {
  onSkip: (reason: string) => void;
  onCancel: () => void;
  busy: boolean;
}) {
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = () => {
    if (reason.trim().length < 3) {
      setError('Give a reason for skipping this site.');
      return;
    }
    onSkip(reason.trim());
  };
  return (
    <View style={styles.root} testID="skip-form">
      <AppText variant="smallStrong" color={colors.ink}>
        Why skip this site?
      </AppText>
      <View style={styles.chips}>
        {skipReasons.map((r, i) => (
          <Button
            key={r}
            label={r}
            variant={reason === r ? 'primary' : 'secondary'}
            onPress={() => (setReason(r), setError(null))}
            testID={`skip-reason-${i}`}
          />
        ))}
      </View>
      <TextInput
        testID="skip-reason-text"
        accessibilityLabel="Reason for skipping"
        placeholder="Or type a reason"
        placeholderTextColor={colors.textMuted}
        value={reason}
        onChangeText={(t) => (setReason(t), setError(null))}
        style={styles.input}
      />
      {error ? (
        <AppText variant="caption" color={colors.danger} testID="skip-error">
          {error}
        </AppText>
      ) : null}
      <View style={styles.chips}>
        <Button label="Skip site" onPress={submit} testID="skip-confirm" busy={busy} />
        <Button label="Cancel" onPress={onCancel} testID="skip-cancel" variant="ghost" />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.sm },
  chips: { gap: space.sm },
  input: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    backgroundColor: colors.surface,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.text,
  },
});
