import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { formatDate } from '@/components/ui/format';
import { colors, radii, space } from '@/constants/theme';
import { siteInfo } from '@/constants/sites';
import type { Comparison } from '@/shared/protocol/review';
import { formatValue } from './measurements-table';

/** Then, now and the change for each measurement and site. */
export function ComparisonTable({ comparison }: { comparison: Comparison }) {
  const rows = comparison.rows.filter((r) => r.then !== null || r.now !== null);
  return (
    <View style={styles.box} testID="comparison-table">
      <AppText variant="heading" color={colors.ink}>
        {formatDate(comparison.then.startedAt)} → {formatDate(comparison.now.startedAt)}
      </AppText>
      <View style={[styles.row, styles.head]}>
        {['Site', 'Measurement', 'Then', 'Now', 'Change'].map((h) => (
          <AppText
            key={h}
            variant="caption"
            color={colors.textMuted}
            style={h === 'Measurement' ? styles.wide : styles.cell}
          >
            {h.toUpperCase()}
          </AppText>
        ))}
      </View>
      {rows.map((r) => (
        <View key={`${r.site}-${r.key}`} style={styles.row} testID={`compare-${r.site}-${r.key}`}>
          <AppText variant="small" style={styles.cell}>
            {siteInfo(r.site).label}
          </AppText>
          <AppText variant="small" style={styles.wide}>
            {r.label}
            {r.unit ? ` (${r.unit})` : ''}
          </AppText>
          <AppText variant="number" style={styles.cell}>
            {formatValue(r.then)}
          </AppText>
          <AppText variant="number" style={styles.cell}>
            {formatValue(r.now)}
          </AppText>
          <AppText variant="number" style={styles.cell}>
            {r.change === null ? '—' : `${r.change > 0 ? '+' : ''}${formatValue(r.change)}`}
          </AppText>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  box: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.xs,
  },
  row: {
    flexDirection: 'row',
    gap: space.sm,
    paddingVertical: 3,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  head: { borderBottomColor: colors.ink },
  cell: { flex: 1 },
  wide: { flex: 2.5 },
});
