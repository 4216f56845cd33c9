import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { ScreenFrame } from '@/components/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/state-views';
import { colors, radii, space } from '@/constants/theme';
import { useClinicKeyPrefetch, useOutbox } from '@/hooks/local-store/queries';
import { SyncPanel } from './sync-panel';
import type { OutboxRow, OutboxState } from '@/hooks/local-store/records';

const stateWords: Record<OutboxState, { label: string; tone: BadgeTone }> = {
  waiting: { label: 'Waiting', tone: 'neutral' },
  sending: { label: 'Sending', tone: 'ink' },
  sent: { label: 'Sent', tone: 'good' },
  failed: { label: 'Failed', tone: 'danger' },
  conflict: { label: 'Conflict', tone: 'caution' },
};

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(2)} MB`;
}

function OutboxItemRow({ item }: { item: OutboxRow }) {
  const words = stateWords[item.state];
  return (
    <View
      style={styles.row}
      testID={`outbox-item-${item.kind}`}
      accessibilityLabel={`${item.label ?? item.kind}, ${words.label}`}
    >
      <View style={styles.head}>
        <AppText variant="smallStrong" color={colors.ink} numberOfLines={1} style={styles.label}>
          {item.label ?? (item.kind === 'clip' ? 'Sealed clip' : (item.entity ?? 'Change'))}
        </AppText>
        <Badge label={words.label} tone={words.tone} testID={`outbox-state-${item.state}`} />
      </View>
      <AppText variant="number" color={colors.textMuted} testID="outbox-size">
        {item.kind === 'clip' ? 'clip' : 'record'} · {formatBytes(item.sizeBytes)}
        {item.state === 'sending' ? ` · ${Math.round(item.progress * 100)}%` : ''}
        {item.attempts > 0 ? ` · ${item.attempts} attempt${item.attempts === 1 ? '' : 's'}` : ''}
      </AppText>
      {item.kind === 'clip' && item.state === 'sending' ? (
        <View style={styles.track} testID="outbox-progress">
          <View style={[styles.fill, { width: `${Math.round(item.progress * 100)}%` }]} />
        </View>
      ) : null}
      {item.state === 'waiting' && item.lastError ? (
        <AppText variant="small" color={colors.textMuted} testID="outbox-retry-reason">
          Will try again: {item.lastError}
        </AppText>
      ) : null}
      {item.state === 'failed' && item.lastError ? (
        <AppText variant="small" color={colors.danger} testID="outbox-error">
          {item.lastError}
        </AppText>
      ) : null}
      {item.state === 'conflict' ? (
        <AppText variant="small" color={colors.caution}>
          The clinic has a newer version; an admin will choose which to keep. Nothing was overwritten.
        </AppText>
      ) : null}
    </View>
  );
}

export function OutboxScreen() {
  useClinicKeyPrefetch();
  const outbox = useOutbox();
  let body;
  if (outbox.isPending) body = <LoadingState label="Reading the outbox…" testID="outbox-loading" />;
  else if (outbox.isError)
    body = (
      <ErrorState
        message={outbox.error.message}
        onRetry={() => void outbox.refetch()}
        testID="outbox-error-state"
      />
    );
  else if (outbox.data.length === 0)
    body = (
      <EmptyState
        title="Nothing to send"
        detail="Finished sessions wait here, sealed, until the device reaches the clinic."
        testID="outbox-empty"
      />
    );
  else {
    const pending = outbox.data.filter((i) => i.state !== 'sent');
    const total = pending.reduce((sum, i) => sum + i.sizeBytes, 0);
    body = (
      <View style={styles.list} testID="outbox-list">
        <AppText variant="caption" color={colors.textMuted} testID="outbox-summary">
          {pending.length} TO SEND · {formatBytes(total)}
        </AppText>
        {outbox.data.map((item) => (
          <OutboxItemRow key={item.id} item={item} />
        ))}
      </View>
    );
  }
  return (
    <ScreenFrame
      title="Outbox"
      subtitle="Sealed clips and session records, sent when the clinic can be reached."
      testID="outbox-screen"
    >
      <View style={styles.column}>
        <SyncPanel />
        {body}
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  column: { maxWidth: 720, width: '100%' },
  list: { gap: space.sm },
  row: {
    padding: space.md,
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    gap: space.xs,
  },
  head: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.sm },
  label: { flex: 1 },
  track: { height: 4, borderRadius: radii.pill, backgroundColor: colors.surfaceMuted, overflow: 'hidden' },
  fill: { height: 4, backgroundColor: colors.pulse },
});
