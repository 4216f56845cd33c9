import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { colors, radii, space } from '@/ui/theme';
import { useFollowUpsDueQuery } from './api';

/** Clients whose follow-up date falls within two weeks (or has passed), for the operator's home. */
export function FollowUpsDue() {
  const due = useFollowUpsDueQuery(14);
  if (due.isPending || due.isError || due.data.length === 0) return null;
  return (
    <View style={styles.card} testID="follow-ups-due">
      <AppText variant="smallStrong" color={colors.ink}>
        Due for follow-up
      </AppText>
      {due.data.map((d) => (
        <View key={d.clientId} style={styles.row} testID={`follow-up-${d.clientId}`}>
          <AppText color={colors.text} style={styles.grow}>
            {d.clientName}
          </AppText>
          <Badge
            label={
              d.daysUntil < 0
                ? `${-d.daysUntil} d overdue`
                : d.daysUntil === 0
                  ? 'today'
                  : `in ${d.daysUntil} d`
            }
            tone={d.daysUntil <= 0 ? 'caution' : 'neutral'}
          />
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    padding: space.md,
    gap: space.sm,
    borderWidth: 1,
    borderColor: colors.line,
  },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  grow: { flex: 1 },
});
