import { StyleSheet, View } from 'react-native';
import { roleLabels } from '@/features/nav/role-labels';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { colors, radii, space } from '@/ui/theme';
import type { TeamMember } from '@/shared/protocol';

export function TeamTable({ members, wide }: { members: TeamMember[]; wide: boolean }) {
  return (
    <View style={styles.table} testID="team-list">
      {wide ? (
        <View style={[styles.row, styles.head]}>
          {['Name', 'E-mail', 'Role', 'Status'].map((h, i) => (
            <View key={h} style={{ flex: i === 1 ? 2 : 1 }}>
              <AppText variant="caption" color={colors.textMuted}>
                {h.toUpperCase()}
              </AppText>
            </View>
          ))}
        </View>
      ) : null}
      {members.map((m) => (
        <View key={m.id} style={[styles.row, !wide && styles.rowNarrow]} testID={`team-row-${m.id}`}>
          <View style={wide ? styles.flex1 : undefined}>
            <AppText variant="smallStrong" color={colors.ink}>
              {m.name}
            </AppText>
          </View>
          <View style={wide ? styles.flex2 : undefined}>
            <AppText variant="small" color={colors.textMuted} numberOfLines={1}>
              {m.email}
            </AppText>
          </View>
          <View style={wide ? styles.flex1 : styles.badges}>
            <Badge label={roleLabels[m.role]} tone="ink" />
            {!wide ? (
              <Badge label={m.disabled ? 'Disabled' : 'Active'} tone={m.disabled ? 'danger' : 'good'} />
            ) : null}
          </View>
          {wide ? (
            <View style={styles.flex1}>
              <Badge label={m.disabled ? 'Disabled' : 'Active'} tone={m.disabled ? 'danger' : 'good'} />
            </View>
          ) : null}
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  table: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    overflow: 'hidden',
  },
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    borderTopWidth: 1,
    borderTopColor: colors.surfaceMuted,
  },
  rowNarrow: { flexDirection: 'column', alignItems: 'flex-start', gap: space.xs },
  head: { backgroundColor: colors.surfaceMuted, paddingVertical: space.sm, borderTopWidth: 0 },
  flex1: { flex: 1 },
  flex2: { flex: 2 },
  badges: { flexDirection: 'row', gap: space.sm },
});
