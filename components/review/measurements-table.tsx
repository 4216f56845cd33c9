import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { colors, space } from '@/constants/theme';
import type { Measurement } from '@/shared/protocol/review';

export function formatValue(v: number | null, unit = ''): string {
  if (v === null) return '—';
  const digits = Number.isInteger(v) || Math.abs(v) >= 100 ? 0 : Math.abs(v) >= 10 ? 1 : 2;
  return `${v.toFixed(digits)}${unit ? ` ${unit}` : ''}`;
}

export function rangeLabel(m: Measurement): string {
  if (!m.range) return 'no range set';
  const { low, high } = m.range;
  if (low !== null && high !== null) return `${formatValue(low)}–${formatValue(high)}`;
  if (low !== null) return `≥ ${formatValue(low)}`;
  if (high !== null) return `≤ ${formatValue(high)}`;
  return 'no range set';
}

/** Each measurement against the clinic's range, the reading in words, and the range's source. */
export function MeasurementsTable({ measurements, testID }: { measurements: Measurement[]; testID: string }) {
  return (
    <View style={styles.table} testID={testID}>
      {measurements.map((m) => {
        const out = m.status === 'above' || m.status === 'below';
        return (
          <View key={m.key} style={[styles.row, out && styles.outRow]} testID={`${testID}-${m.key}`}>
            <AppText variant="small" color={colors.text} style={styles.label}>
              {m.label}
            </AppText>
            <AppText variant="number" color={out ? colors.danger : colors.ink} style={styles.value}>
              {formatValue(m.value, m.unit)}
            </AppText>
            <View style={styles.range}>
              <AppText variant="caption" color={colors.textMuted}>
                {rangeLabel(m)}
              </AppText>
              {m.range ? (
                <AppText variant="caption" color={colors.textMuted} numberOfLines={2}>
                  Source: {m.range.source}
                </AppText>
              ) : null}
            </View>
            <AppText
              variant={out ? 'smallStrong' : 'small'}
              color={out ? colors.danger : colors.textMuted}
              style={styles.reading}
            >
              {out ? `⚠ ${m.reading}` : m.reading}
            </AppText>
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  table: { borderTopWidth: 1, borderTopColor: colors.line },
  row: {
    flexDirection: 'row',
    gap: space.sm,
    paddingVertical: 4,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
    alignItems: 'center',
  },
  outRow: { backgroundColor: colors.dangerSoft },
  label: { flex: 2.2 },
  value: { flex: 1.2, textAlign: 'right' },
  range: { flex: 2 },
  reading: { flex: 2.2 },
});
