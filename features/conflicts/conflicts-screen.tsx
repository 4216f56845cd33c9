import { useRouter } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { conflictStatusWords } from '@/ui/status-words';
import { colors, radii, space } from '@/ui/theme';
import { useConflictListQuery, type ConflictStatusFilter } from './api';
import { useLayout } from '@/ui/use-layout';
import type { ConflictSummary } from '@/shared/protocol/sync';
import { changedBy, entityWords, fieldLabel, whenText } from './conflict-words';

const filters: readonly { value: ConflictStatusFilter; label: string }[] = [
  { value: 'open', label: 'Open' },
  { value: 'resolved', label: 'Settled' },
  { value: 'all', label: 'All' },
];

function ConflictRow({ c, wide, onOpen }: { c: ConflictSummary; wide: boolean; onOpen: () => void }) {
  const differing = c.differingFields.map(fieldLabel).join(', ') || 'none now';
  return (
    <Pressable
      testID={`conflict-row-${c.id}`}
      accessibilityRole="link"
      accessibilityLabel={`${c.label}, ${entityWords[c.entity]}, ${c.status === 'open' ? 'to settle' : 'settled'}`}
      onPress={onOpen}
      style={({ pressed }) => [styles.row, wide && styles.rowWide, pressed && styles.rowPressed]}
    >
      <View style={wide ? styles.colWhat : undefined}>
        <AppText variant="bodyStrong" color={colors.ink}>
          {c.label || entityWords[c.entity]}
        </AppText>
        <AppText variant="small" color={colors.textMuted}>
          {entityWords[c.entity]} · differs in {differing}
        </AppText>
      </View>
      <View style={wide ? styles.colWho : undefined}>
        <AppText variant="small" color={colors.text}>
          Changed by {changedBy(c.userName)}
        </AppText>
        <AppText variant="small" color={colors.text}>
          The record last changed by {changedBy(c.serverUserName)}
        </AppText>
      </View>
      <View style={[wide ? styles.colWhen : styles.phoneFoot]}>
        <AppText variant="number" color={colors.text}>
          {whenText(c.createdAt)}
        </AppText>
        <Badge {...conflictStatusWords[c.status]} />
      </View>
    </Pressable>
  );
}

/** Rows two devices changed from the same version; nothing was overwritten until an admin chooses. */
export function ConflictsScreen() {
  const [status, setStatus] = useState<ConflictStatusFilter>('open');
  const list = useConflictListQuery(status);
  const { isWide } = useLayout();
  const router = useRouter();

  let body;
  if (list.isPending) body = <LoadingState label="Loading conflicts…" testID="conflicts-loading" />;
  else if (list.isError)
    body = (
      <ErrorState message={list.error.message} onRetry={() => void list.refetch()} testID="conflicts-error" />
    );
  else if (list.data.length === 0)
    body = (
      <EmptyState
        title={status === 'open' ? 'No open conflicts' : 'No conflicts'}
        detail="When two phones change the same record while offline, the later change waits here for you to settle."
        testID="conflicts-empty"
      />
    );
  else
    body = (
      <View style={styles.table} testID="conflicts-list">
        {isWide ? (
          <View style={[styles.rowWide, styles.head]}>
            <AppText variant="caption" color={colors.textMuted} style={styles.colWhat}>
              WHAT
            </AppText>
            <AppText variant="caption" color={colors.textMuted} style={styles.colWho}>
              WHOSE DEVICES
            </AppText>
            <AppText variant="caption" color={colors.textMuted} style={styles.colWhen}>
              WHEN
            </AppText>
          </View>
        ) : null}
        {list.data.map((c) => (
          <ConflictRow
            key={c.id}
            c={c}
            wide={isWide}
            onOpen={() => router.push({ pathname: '/conflicts/[conflictId]', params: { conflictId: c.id } })}
          />
        ))}
      </View>
    );

  return (
    <ScreenFrame
      title="Conflicts"
      subtitle="Changes made offline that met a newer change at the clinic"
      testID="conflicts-screen"
      header={
        <View style={styles.filters} accessibilityRole="radiogroup">
          {filters.map((f) => (
            <Pressable
              key={f.value}
              testID={`conflicts-filter-${f.value}`}
              accessibilityRole="radio"
              accessibilityState={{ checked: status === f.value }}
              onPress={() => setStatus(f.value)}
              style={[styles.chip, status === f.value && styles.chipOn]}
            >
              <AppText variant="smallStrong" color={status === f.value ? colors.textOnInk : colors.ink}>
                {f.label}
              </AppText>
            </Pressable>
          ))}
        </View>
      }
    >
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  filters: { flexDirection: 'row', gap: space.sm, marginTop: space.sm },
  chip: {
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    borderRadius: radii.pill,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
  table: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    overflow: 'hidden',
  },
  head: { backgroundColor: colors.surfaceMuted, paddingVertical: space.sm },
  row: { gap: space.xs, padding: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  rowWide: { flexDirection: 'row', alignItems: 'center', gap: space.lg, paddingHorizontal: space.lg },
  rowPressed: { backgroundColor: colors.surfaceMuted },
  colWhat: { flex: 3 },
  colWho: { flex: 3 },
  colWhen: { flex: 1.4, gap: space.xs },
  phoneFoot: { flexDirection: 'row', alignItems: 'center', gap: space.md },
});
