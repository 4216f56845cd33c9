import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { colors, radii } from '@/ui/theme';
import { useOutboxCount } from '@/device/local-store/queries';

/** The number of outbox items not yet acknowledged by the clinic server; nothing when the queue is empty. */
export function OutboxCountBadge() {
  const count = useOutboxCount().data ?? 0;
  if (count === 0) return null;
  return (
    <View style={styles.pill} testID="outbox-count" accessibilityLabel={`${count} waiting to sync`}>
      <AppText variant="caption" color={colors.paper}>
        {count > 99 ? '99+' : String(count)}
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  pill: {
    minWidth: 20,
    paddingHorizontal: 5,
    borderRadius: radii.pill,
    backgroundColor: colors.accent,
    alignItems: 'center',
  },
});
