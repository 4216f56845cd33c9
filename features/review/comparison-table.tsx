import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { formatDate } from '@/ui/format';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import type { Comparison } from '@/shared/protocol/review';
import { changeWords } from './change-words';
import { formatValue } from './measurements-table';

/** Each measurement then and now at every site, with the change. */
export function ComparisonTable({ comparison }: { comparison: Comparison }) {
  // Five columns do not fit a phone: there each measurement is a block with one line per site.
  const { isWide } = useLayout();
  const keys = [
    ...new Set(comparison.rows.filter((r) => r.then !== null || r.now !== null).map((r) => r.key)),
  ];
  return (
    <View style={styles.box} testID="comparison-table">
      <AppText variant="heading" color={colors.ink}>
        Then ({formatDate(comparison.then.startedAt)}) → now ({formatDate(comparison.now.startedAt)})
      </AppText>
      {isWide ? (
        <View style={[styles.row, styles.head]}>
          <AppText variant="caption" color={colors.textMuted} style={styles.label}>
            MEASUREMENT
          </AppText>
          {sites.map((s) => (
            <AppText key={s.id} variant="caption" color={colors.textMuted} style={styles.cell}>
              {s.label.toUpperCase()}
            </AppText>
          ))}
        </View>
      ) : null}
      {keys.map((key) => {
        const any = comparison.rows.find((r) => r.key === key)!;
        return (
          <View key={key} style={isWide ? styles.row : styles.block}>
            <AppText variant={isWide ? 'small' : 'smallStrong'} style={isWide && styles.label}>
              {any.label}
              {any.unit ? ` (${any.unit})` : ''}
            </AppText>
            {sites.map((s) => {
              const r = comparison.rows.find((x) => x.key === key && x.site === s.id);
              const change = changeWords(r?.then ?? null, r?.now ?? null, any.unit);
              return (
                <View
                  key={s.id}
                  style={isWide ? styles.cell : styles.siteLine}
                  testID={`compare-${s.id}-${key}`}
                >
                  {isWide ? null : (
                    <AppText variant="small" color={colors.textMuted} style={styles.siteName}>
                      {s.label}
                    </AppText>
                  )}
                  <AppText variant="number" color={colors.text}>
                    {formatValue(r?.then ?? null)} then, {formatValue(r?.now ?? null)} now
                  </AppText>
                  <AppText
                    variant="caption"
                    color={colors.textMuted}
                    testID={`compare-${s.id}-${key}-change`}
                  >
                    {change.arrow ? `${change.arrow} ` : ''}
                    {change.words}
                  </AppText>
                </View>
              );
            })}
          </View>
        );
      })}
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
    paddingVertical: 4,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
    alignItems: 'center',
  },
  head: { borderBottomColor: colors.ink },
  label: { flex: 2 },
  cell: { flex: 1.3 },
  block: { gap: 2, paddingVertical: space.xs, borderBottomWidth: 1, borderBottomColor: colors.line },
  siteLine: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'baseline', columnGap: space.sm },
  siteName: { width: 76 },
});
