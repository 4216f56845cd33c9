import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { colors, space } from '@/ui/theme';
import type { Measurement } from '@/shared/protocol/review';
import { isOutOfRange, keyMeasureKeys } from './review-words';

export function formatValue(v: number | null, unit = ''): string {
  if (v === null) return '—';
  const digits = Number.isInteger(v) || Math.abs(v) >= 100 ? 0 : Math.abs(v) >= 10 ? 1 : 2;
  return `${v.toFixed(digits)}${unit ? ` ${unit}` : ''}`;
}

export function rangeLabel(m: Measurement): string {
  return rangeWords(m.range);
}

/** "60–100", or "≥ 6" / "≤ 40" for a range open at one end. */
export function rangeWords(range: { low: number | null; high: number | null } | null): string {
  if (!range) return 'no range set';
  const { low, high } = range;
  if (low !== null && high !== null) return `${formatValue(low)}–${formatValue(high)}`;
  if (low !== null) return `≥ ${formatValue(low)}`;
  if (high !== null) return `≤ ${formatValue(high)}`;
  return 'no range set';
}

/** The numbered sources of a session's ranges, in the order the measurements first cite them. */
export function sourceNumbers(measurements: Measurement[]): string[] {
  const sources: string[] = [];
  for (const m of measurements)
    if (m.range && !sources.includes(m.range.source)) sources.push(m.range.source);
  return sources;
}

const isKey = (m: Measurement) => (keyMeasureKeys as readonly string[]).includes(m.key);

/**
 * The key measures against the clinic's range with the reading in words and a numbered footnote to the range's
 * source (listed in full in the sources panel); the rest behind "More measures".
 */
export function MeasurementsTable({
  measurements,
  sources,
  testID,
}: {
  measurements: Measurement[];
  sources: string[];
  testID: string;
}) {
  const [more, setMore] = useState(false);
  const shown = measurements.filter((m) => more || isKey(m));
  const hidden = measurements.filter((m) => !isKey(m));
  return (
    <View style={styles.table} testID={testID}>
      {shown.map((m) => {
        const out = isOutOfRange(m);
        const footnote = m.range ? sources.indexOf(m.range.source) + 1 : 0;
        return (
          <View key={m.key} style={[styles.row, out && styles.outRow]} testID={`${testID}-${m.key}`}>
            <AppText variant="small" color={colors.text} style={styles.label}>
              {m.label}
            </AppText>
            <AppText variant="number" color={out ? colors.danger : colors.ink} style={styles.value}>
              {formatValue(m.value, m.unit)}
            </AppText>
            <AppText variant="caption" color={colors.textMuted} style={styles.range}>
              {rangeLabel(m)}
              {footnote > 0 ? ` [${footnote}]` : ''}
            </AppText>
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
      {hidden.length ? (
        <Button
          label={more ? 'Fewer measures' : `More measures (${hidden.length})`}
          variant="ghost"
          testID={`${testID}-more`}
          onPress={() => setMore(!more)}
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  table: { borderTopWidth: 1, borderTopColor: colors.line },
  row: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    gap: space.sm,
    paddingVertical: 4,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
    alignItems: 'center',
  },
  outRow: { backgroundColor: colors.dangerSoft },
  label: { flexGrow: 2, flexBasis: 140 },
  value: { flexGrow: 1, flexBasis: 70, textAlign: 'right' },
  range: { flexGrow: 1, flexBasis: 80 },
  reading: { flexGrow: 2, flexBasis: 160 },
});
