import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { colors, radii, space } from '@/ui/theme';
import type { ConflictDetail } from '@/shared/protocol/sync';
import { changedBy, fieldLabel, valueText } from './conflict-words';

type Props = { conflict: ConflictDetail; wide: boolean };

// Once settled, the fields that differed are the ones the admin chose for: the row no longer differs in them.
const differingOf = (conflict: ConflictDetail) =>
  conflict.resolution ? Object.keys(conflict.resolution.kept) : conflict.differingFields;

function fieldsOf(conflict: ConflictDetail): string[] {
  const names = new Set([...Object.keys(conflict.server.data), ...Object.keys(conflict.client.data)]);
  // Differing fields first, so the admin reads what matters before the rest.
  const differing = differingOf(conflict).filter((f) => f !== 'deletedAt');
  const rest = [...names].filter((f) => !differing.includes(f));
  return [...differing, ...rest, 'deletedAt'];
}

const sideValue = (side: ConflictDetail['server'], field: string) =>
  field === 'deletedAt' ? side.deletedAt : side.data[field];

/**
 * Both versions of the row, field by field; a differing field says so in words as well as colour, and once
 * settled, which side it kept.
 */
export function VersionsSideBySide({ conflict, wide }: Props) {
  const serverHead = `The clinic’s record · last changed by ${changedBy(conflict.serverUserName)}`;
  const clientHead = `The change from ${changedBy(conflict.userName)}`;
  const kept = conflict.resolution?.kept;
  return (
    <View style={styles.table} testID="versions">
      {wide ? (
        <View style={[styles.row, styles.headRow]}>
          <AppText variant="caption" color={colors.textMuted} style={styles.fieldCol}>
            Field
          </AppText>
          <AppText variant="smallStrong" color={colors.ink} style={styles.valueCol}>
            {serverHead}
          </AppText>
          <AppText variant="smallStrong" color={colors.ink} style={styles.valueCol}>
            {clientHead}
          </AppText>
        </View>
      ) : (
        <View style={styles.phoneHead}>
          <AppText variant="small" color={colors.ink}>
            {serverHead}
          </AppText>
          <AppText variant="small" color={colors.ink}>
            {clientHead}
          </AppText>
        </View>
      )}
      {fieldsOf(conflict).map((field) => {
        const differs = differingOf(conflict).includes(field);
        const server = valueText(field, sideValue(conflict.server, field));
        const client = valueText(field, sideValue(conflict.client, field));
        return (
          <View
            key={field}
            style={[
              styles.row,
              !wide && styles.rowPhone,
              differs && (kept ? styles.rowSettled : styles.rowDiffers),
            ]}
            testID={`version-row-${field}`}
            accessibilityLabel={
              differs
                ? `${fieldLabel(field)} differs: record ${server}, change ${client}`
                : `${fieldLabel(field)} same on both: ${server}`
            }
          >
            <View style={wide ? styles.fieldCol : styles.fieldPhone}>
              <AppText variant="smallStrong" color={colors.ink}>
                {fieldLabel(field)}
              </AppText>
              {differs && kept?.[field] ? (
                <Badge
                  label={kept[field] === 'server' ? 'Kept the record' : 'Kept the change'}
                  tone="good"
                  testID={`version-kept-${field}`}
                />
              ) : differs ? (
                <Badge label="Differs" tone="caution" testID={`version-differs-${field}`} />
              ) : (
                <AppText variant="caption" color={colors.textMuted}>
                  same
                </AppText>
              )}
            </View>
            {wide ? (
              <>
                <AppText variant="small" color={colors.text} style={styles.valueCol}>
                  {server}
                </AppText>
                <AppText
                  variant={differs ? 'smallStrong' : 'small'}
                  color={colors.text}
                  style={styles.valueCol}
                >
                  {client}
                </AppText>
              </>
            ) : (
              <View style={styles.phoneValues}>
                <AppText variant="small" color={colors.text}>
                  Record: {server}
                </AppText>
                {differs ? (
                  <AppText variant="smallStrong" color={colors.text}>
                    Change: {client}
                  </AppText>
                ) : null}
              </View>
            )}
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  table: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    overflow: 'hidden',
  },
  headRow: { backgroundColor: colors.surfaceMuted },
  phoneHead: { padding: space.md, gap: space.xs, backgroundColor: colors.surfaceMuted },
  row: {
    flexDirection: 'row',
    gap: space.lg,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.line,
    borderLeftWidth: 4,
    borderLeftColor: 'transparent',
  },
  rowPhone: { flexDirection: 'column', gap: space.xs, paddingHorizontal: space.md },
  rowDiffers: { backgroundColor: colors.cautionSoft, borderLeftColor: colors.caution },
  rowSettled: { borderLeftColor: colors.pulse },
  fieldCol: { width: 200, gap: 2 },
  fieldPhone: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  valueCol: { flex: 1 },
  phoneValues: { gap: 2 },
});
