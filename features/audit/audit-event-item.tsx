import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { AuditEventRow } from '@/shared/protocol/practice';
import { AppText } from '@/ui/app-text';
import { formatDateTime } from '@/ui/format';
import { colors, radii, space } from '@/ui/theme';
import { auditSentence } from './audit-words';

/** The stored event as it is, for an auditor who needs the exact record: shown only when asked for. */
function recordLines(e: AuditEventRow): [string, string][] {
  const lines: [string, string][] = [
    ['Kind', e.action],
    ['Recorded at', e.occurredAt],
  ];
  if (e.userId) lines.push(['Team member', e.userId]);
  if (e.entity) lines.push(['Concerns', `${e.entity}${e.entityId ? ` ${e.entityId}` : ''}`]);
  if (e.clientId && e.entity !== 'client') lines.push(['Client', e.clientId]);
  if (e.ip) lines.push(['Network address', e.ip]);
  for (const [key, value] of Object.entries(e.details ?? {}))
    lines.push([key, typeof value === 'object' ? JSON.stringify(value) : String(value)]);
  return lines;
}

/** One event of the log as a sentence and its time, the stored record behind "Details". */
export function AuditEventItem({ event, currency }: { event: AuditEventRow; currency: string | null }) {
  const [open, setOpen] = useState(false);
  return (
    <View style={styles.item} testID={`audit-row-${event.id}`}>
      <View style={styles.line}>
        <View style={styles.words}>
          <AppText color={colors.ink} testID={`audit-sentence-${event.id}`}>
            {auditSentence(event, { currency })}
          </AppText>
          <AppText variant="number" color={colors.textMuted}>
            {formatDateTime(event.occurredAt)}
          </AppText>
        </View>
        <Pressable
          onPress={() => setOpen((o) => !o)}
          accessibilityRole="button"
          accessibilityState={{ expanded: open }}
          accessibilityLabel={open ? 'Hide the stored record' : 'Show the stored record'}
          hitSlop={8}
          style={({ pressed }) => [styles.toggle, pressed && styles.pressed]}
          testID={`audit-details-${event.id}`}
        >
          <AppText variant="smallStrong" color={colors.accent}>
            {open ? 'Hide details' : 'Details'}
          </AppText>
        </Pressable>
      </View>
      {open ? (
        <View style={styles.record} testID={`audit-record-${event.id}`}>
          {recordLines(event).map(([label, value]) => (
            <View key={label} style={styles.recordLine}>
              <AppText variant="smallStrong" color={colors.textMuted} style={styles.recordLabel}>
                {label}
              </AppText>
              <AppText variant="small" color={colors.text} style={styles.recordValue} selectable>
                {value}
              </AppText>
            </View>
          ))}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  item: {
    paddingVertical: space.md,
    borderBottomWidth: StyleSheet.hairlineWidth,
    borderBottomColor: colors.line,
    gap: space.sm,
  },
  line: { flexDirection: 'row', gap: space.md, alignItems: 'flex-start' },
  words: { flex: 1, gap: 2 },
  toggle: { paddingVertical: space.xs, paddingHorizontal: space.sm, borderRadius: radii.sm },
  pressed: { backgroundColor: colors.surfaceMuted },
  record: {
    backgroundColor: colors.surfaceMuted,
    borderRadius: radii.md,
    padding: space.md,
    gap: space.xs,
  },
  recordLine: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  recordLabel: { minWidth: 140 },
  recordValue: { flexShrink: 1 },
});
