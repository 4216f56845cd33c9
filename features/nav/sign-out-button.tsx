import { useState } from 'react';
import { Modal, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { SignOutIcon } from '@/ui/icons';
import { colors, radii, space } from '@/ui/theme';
import { useAuth } from '@/features/auth/auth-context';
import { useDeviceSync, type UnsentSummary } from '@/device/sync/sync-context';

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** What would wait on this phone, in words, or null when everything reached the clinic. */
export function unsentWords(unsent: UnsentSummary | undefined): string | null {
  if (!unsent || unsent.items === 0) return null;
  const what =
    unsent.recordings > 0
      ? `${plural(unsent.recordings, 'recording')} from ${plural(unsent.sessions, 'session')}`
      : unsent.sessions > 0
        ? `the records of ${plural(unsent.sessions, 'session')}`
        : `the details of ${plural(unsent.clients, 'new client')}`;
  return (
    `${what[0]!.toUpperCase()}${what.slice(1)} ${unsent.recordings === 1 ? 'has' : 'have'} ` +
    'not reached the clinic yet. They stay sealed on this phone and are sent after the next sign-in here.'
  );
}

export function SignOutButton({ onInk = false }: { onInk?: boolean }) {
  const { signOut } = useAuth();
  const { unsent } = useDeviceSync();
  const [busy, setBusy] = useState(false);
  const [asking, setAsking] = useState(false);
  const warning = unsentWords(unsent);
  const leave = () => {
    setAsking(false);
    setBusy(true);
    void signOut();
  };
  return (
    <>
      <Button
        label="Sign out"
        testID="sign-out-button"
        variant={onInk ? 'on-ink' : 'secondary'}
        busy={busy}
        icon={(color) => <SignOutIcon color={color} />}
        onPress={() => (warning ? setAsking(true) : leave())}
      />
      <Modal visible={asking} transparent animationType="fade" onRequestClose={() => setAsking(false)}>
        <View style={styles.backdrop}>
          <View style={styles.dialog} accessibilityRole="alert" testID="sign-out-warning">
            <AppText variant="heading" color={colors.ink}>
              Sign out with work still to send?
            </AppText>
            <AppText variant="body" color={colors.text} testID="sign-out-warning-text">
              {warning}
            </AppText>
            <Button label="Stay signed in" onPress={() => setAsking(false)} testID="sign-out-cancel" />
            <Button
              label="Sign out, keep them here"
              variant="secondary"
              onPress={leave}
              testID="sign-out-confirm"
            />
          </View>
        </View>
      </Modal>
    </>
  );
}

const styles = StyleSheet.create({
  backdrop: {
    flex: 1,
    backgroundColor: 'rgba(0, 0, 0, 0.4)',
    alignItems: 'center',
    justifyContent: 'center',
    padding: space.lg,
  },
  dialog: {
    width: '100%',
    maxWidth: 420,
    gap: space.md,
    padding: space.lg,
    borderRadius: radii.lg,
    backgroundColor: colors.surface,
  },
});
