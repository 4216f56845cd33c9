import { router } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { Badge } from '@/components/ui/badge';
import { formatDate } from '@/components/ui/format';
import { colors, radii, space } from '@/constants/theme';
import { useLocalClients } from '@/hooks/local-store/queries';

/**
 * Clients kept on this device (added here, or opened once while online), so the home still lists someone to
 * record when the clinic server cannot be reached. `excludeIds` drops those the clinic list already shows.
 */
export function DeviceClients({
  search,
  excludeIds = [],
}: {
  search: string;
  excludeIds?: readonly string[];
}) {
  const clients = useLocalClients(search);
  const shown = (clients.data ?? []).filter((c) => !excludeIds.includes(c.id));
  if (shown.length === 0) return null;
  return (
    <View style={styles.list} testID="device-clients">
      <AppText variant="caption" color={colors.textMuted}>
        ON THIS DEVICE
      </AppText>
      {shown.map((c) => (
        <Pressable
          key={c.id}
          testID={`device-client-${c.id}`}
          accessibilityRole="link"
          accessibilityLabel={`${c.firstName} ${c.lastName}`}
          onPress={() => router.push(`/clients/${c.id}`)}
          style={({ pressed }) => [styles.row, pressed && styles.pressed]}
        >
          <View style={styles.main}>
            <AppText variant="bodyStrong" color={colors.ink} numberOfLines={1}>
              {c.firstName} {c.lastName}
            </AppText>
            <AppText variant="number" color={colors.textMuted}>
              {c.dateOfBirth ? `born ${formatDate(c.dateOfBirth)}` : 'date of birth not given'}
            </AppText>
          </View>
          {c.origin === 'device' ? <Badge label="Not yet synced" tone="neutral" /> : null}
        </Pressable>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
  },
  pressed: { backgroundColor: colors.surfaceMuted },
  main: { flex: 1, gap: 2 },
});
