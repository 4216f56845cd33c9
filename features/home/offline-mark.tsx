import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { colors, radii, space } from '@/ui/theme';
import { useDeviceSync } from '@/device/sync/sync-context';

/** A quiet mark while the phone has no network: what is shown is what the phone keeps, and that is normal. */
export function OfflineMark() {
  const sync = useDeviceSync();
  if (sync.online) return null;
  return (
    <View
      style={styles.mark}
      testID="offline-mark"
      accessibilityLabel="Offline: showing what this phone keeps"
    >
      <View style={styles.dot} />
      <AppText variant="caption" color={colors.textMuted}>
        Offline
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  mark: {
    flexDirection: 'row',
    alignItems: 'center',
    alignSelf: 'flex-start',
    gap: space.xs,
    paddingHorizontal: space.sm,
    paddingVertical: 2,
    borderRadius: radii.pill,
    backgroundColor: colors.surfaceMuted,
  },
  dot: { width: 6, height: 6, borderRadius: 3, backgroundColor: colors.textMuted },
});
