import type { ReactNode } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';

export type SortDir = 'asc' | 'desc';

export type Column<T> = {
  key: string;
  title: string;
  /** Relative width on wide screens. */
  flex?: number;
  /** Present when the column can sort the table. */
  sortKey?: string;
  render: (row: T) => ReactNode;
};

type Props<T> = {
  rows: readonly T[];
  columns: readonly Column<T>[];
  rowKey: (row: T) => string;
  wide: boolean;
  testID: string;
  rowTestID?: (row: T) => string;
  sort?: { key: string; dir: SortDir };
  onSort?: (key: string) => void;
  onRowPress?: (row: T) => void;
};

/** Rows with a header on wide screens; on phones each row becomes a small card of label and value. */
export function DataTable<T>({
  rows,
  columns,
  rowKey,
  wide,
  testID,
  rowTestID,
  sort,
  onSort,
  onRowPress,
}: Props<T>) {
  return (
    <View style={styles.table} testID={testID}>
      {wide ? (
        <View style={[styles.row, styles.head]} accessibilityRole="header">
          {columns.map((c) => {
            const active = sort && c.sortKey === sort.key;
            const label = `${c.title.toUpperCase()}${active ? (sort.dir === 'asc' ? ' ↑' : ' ↓') : ''}`;
            return (
              <View key={c.key} style={{ flex: c.flex ?? 1 }}>
                {c.sortKey && onSort ? (
                  <Pressable
                    onPress={() => onSort(c.sortKey!)}
                    accessibilityRole="button"
                    accessibilityLabel={`Sort by ${c.title}`}
                    testID={`${testID}-sort-${c.sortKey}`}
                  >
                    <AppText variant="caption" color={active ? colors.ink : colors.textMuted}>
                      {label}
                    </AppText>
                  </Pressable>
                ) : (
                  <AppText variant="caption" color={colors.textMuted}>
                    {label}
                  </AppText>
                )}
              </View>
            );
          })}
        </View>
      ) : null}
      {rows.map((row) => {
        const body = wide ? (
          columns.map((c) => (
            <View key={c.key} style={{ flex: c.flex ?? 1, minWidth: 0 }}>
              {c.render(row)}
            </View>
          ))
        ) : (
          <View style={styles.card}>
            {columns.map((c) => (
              <View key={c.key} style={styles.cardLine}>
                <AppText variant="caption" color={colors.textMuted} style={styles.cardLabel}>
                  {c.title.toUpperCase()}
                </AppText>
                <View style={styles.cardValue}>{c.render(row)}</View>
              </View>
            ))}
          </View>
        );
        const key = rowKey(row);
        return onRowPress ? (
          <Pressable
            key={key}
            testID={rowTestID?.(row)}
            accessibilityRole="button"
            onPress={() => onRowPress(row)}
            style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
              styles.row,
              (pressed || hovered) && styles.rowHover,
            ]}
          >
            {body}
          </Pressable>
        ) : (
          <View key={key} testID={rowTestID?.(row)} style={styles.row}>
            {body}
          </View>
        );
      })}
    </View>
  );
}

/** Text in a table cell, one line on wide screens. */
export function Cell({
  children,
  strong = false,
  muted = false,
  figures = false,
  testID,
}: {
  children: ReactNode;
  strong?: boolean;
  muted?: boolean;
  /** Numbers and amounts: the body face with tabular digits, so columns of figures line up. */
  figures?: boolean;
  testID?: string;
}) {
  return (
    <AppText
      variant={figures ? 'number' : strong ? 'smallStrong' : 'small'}
      color={muted ? colors.textMuted : strong ? colors.ink : colors.text}
      numberOfLines={2}
      testID={testID}
    >
      {children}
    </AppText>
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
  rowHover: { backgroundColor: colors.paper },
  head: { backgroundColor: colors.surfaceMuted, paddingVertical: space.sm, borderTopWidth: 0 },
  card: { flex: 1, gap: space.xs },
  cardLine: { flexDirection: 'row', gap: space.sm, alignItems: 'flex-start' },
  cardLabel: { width: 96, paddingTop: 2 },
  cardValue: { flex: 1, minWidth: 0 },
});
