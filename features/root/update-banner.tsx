import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { colors, space } from '@/ui/theme';
import { useAppUpdate } from './app-update';
import { serviceWorkerPort } from './service-worker';
import type { ServiceWorkerPort } from './service-worker-port';

/** Says when a new version of the app is ready, and reloads only when the person asks. */
export function UpdateBanner({ port = serviceWorkerPort }: { port?: ServiceWorkerPort }) {
  const update = useAppUpdate(port);
  if (!update.ready) return null;
  return (
    <View style={styles.bar} testID="update-banner" accessibilityLiveRegion="polite">
      <AppText variant="small" color={colors.textOnInk} style={styles.words}>
        {update.held
          ? 'A new version is ready. You can reload once this session is sealed.'
          : 'A new version is ready.'}
      </AppText>
      {update.held ? null : (
        <Button label="Reload" variant="on-ink" onPress={update.reload} testID="update-reload" />
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  bar: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    backgroundColor: colors.ink,
  },
  words: { flex: 1 },
});
