import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { Badge } from '@/components/ui/badge';
import { colors, radii, space } from '@/constants/theme';
import type { ConflictDetail } from '@/shared/protocol/sync';
import { fieldLabel, shortDevice, valueText } from './conflict-words';

type Props = { conflict: ConflictDetail; wide: boolean };

function fieldsOf(conflict: ConflictDetail): string[] {
  const names = new Set([...Object.keys(conflict.server.data), ...Object.keys(conflict.client.data)]);
  // Differing fields first, so the admin reads what matters before the rest.
  const differing = conflict.differingFields.filter((f) => f !== 'deletedAt');
  const rest = [...names].filter((f) => !differing.includes(f));
  return [...differing, ...rest, 'deletedAt'];
}

const sideValue = (side: ConflictDetail['server'], field: string) =>
  field === 'deletedAt' ? side.deletedAt : side.data[field];

/** Both versions of the row, field by field; a differing field says so in words as well as colour. */
export function VersionsSideBySide({ conflict, wide }: Props) {
  const serverHead = `On the server · version ${conflict.server.version} · last written by ${conflict.serverUserName ?? 'unknown'} (${shortDevice(conflict.serverDeviceId)})`;
  const clientHead = `From the device · based on version ${conflict.client.version} · by ${conflict.userName ?? 'unknown'} (${shortDevice(conflict.deviceId)})`;
  return (
    <View style={styles.table} testID="versions">
      {wide ? (
        <View style={[styles.row, styles.headRow]}>
          <AppText variant="caption" color={colors.textMuted} style={styles.fieldCol}>
            FIELD
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
            Server: {serverHead.replace(/^On the server · /, '')}
          </AppText>
          <AppText variant="small" color={colors.ink}>
            Device: {clientHead.replace(/^From the device · /, '')}
          </AppText>
        </View>
      )}
      {fieldsOf(conflict).map((field) => {
        const differs = conflict.differingFields.includes(field);
        const server = valueText(field, sideValue(conflict.server, field));
        const client = valueText(field, sideValue(conflict.client, field));
        return (
          <View
            key={field}
            style={[styles.row, !wide && styles.rowPhone, differs && styles.rowDiffers]}
            testID={`version-row-${field}`}
            accessibilityLabel={
              differs
                ? `${fieldLabel(field)} differs: server ${server}, device ${client}`
                : `${fieldLabel(field)} same on both: ${server}`
            }
          >
            <View style={wide ? styles.fieldCol : styles.fieldPhone}>
              <AppText variant="smallStrong" color={colors.ink}>
                {fieldLabel(field)}
              </AppText>
              {differs ? (
                <Badge label="≠ DIFFERS" tone="caution" testID={`version-differs-${field}`} />
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
                  Server: {server}
                </AppText>
                {differs ? (
                  <AppText variant="smallStrong" color={colors.text}>
                    Device: {client}
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
  fieldCol: { width: 200, gap: 2 },
  fieldPhone: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  valueCol: { flex: 1 },
  phoneValues: { gap: 2 },
});
