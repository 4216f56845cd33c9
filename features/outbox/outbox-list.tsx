import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Badge, type BadgeTone } from '@/ui/badge';
import { formatDate, formatTime } from '@/ui/format';
import { siteInfo } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import type { OutboxRow, OutboxState } from '@/device/local-store/records';
import { groupOutbox, groupProgressWords, type OutboxGroup } from './outbox-groups';

const stateWords: Record<OutboxState, { label: string; tone: BadgeTone }> = {
  waiting: { label: 'Waiting', tone: 'neutral' },
  sending: { label: 'Sending', tone: 'ink' },
  sent: { label: 'Sent', tone: 'good' },
  failed: { label: 'Not accepted', tone: 'caution' },
  conflict: { label: 'Kept for an admin', tone: 'caution' },
};

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(2)} MB`;
}

/** What the item is, in words; older items carry no label of their own. */
function itemWords(item: OutboxRow): string {
  if (item.label) return item.label;
  const site = item.site ? siteInfo(item.site).label : 'Site';
  if (item.kind === 'clip') return `${site} recording`;
  if (item.entity === 'clients') return 'Client details';
  if (item.entity === 'consents') return 'Consent';
  if (item.entity === 'recording_sessions') return 'Session record';
  return `${site} details`;
}

function OutboxItemLine({ item, details }: { item: OutboxRow; details: boolean }) {
  const words = stateWords[item.state];
  return (
    <View
      style={styles.item}
      testID={`outbox-item-${item.kind}`}
      accessibilityLabel={`${itemWords(item)}, ${words.label}`}
    >
      <View style={styles.head}>
        <AppText variant="small" color={colors.text} numberOfLines={1} style={styles.grow}>
          {itemWords(item)}
        </AppText>
        <Badge label={words.label} tone={words.tone} testID={`outbox-state-${item.state}`} />
      </View>
      {item.state === 'failed' ? (
        <AppText variant="small" color={colors.text} testID="outbox-refused-help">
          The clinic did not accept this item. Nothing is lost: it stays sealed on this phone. Open Details
          and show the reason to your clinic’s admin, who can put it right.
        </AppText>
      ) : null}
      {item.state === 'conflict' ? (
        <AppText variant="small" color={colors.text}>
          The clinic has a newer change to the same record; an admin will choose which to keep. Nothing was
          overwritten, and nothing is needed from you.
        </AppText>
      ) : null}
      {details ? (
        <View style={styles.details}>
          <AppText variant="number" color={colors.textMuted} testID="outbox-size">
            {item.kind === 'clip' ? 'sealed clip' : 'record'} · {formatBytes(item.sizeBytes)}
            {item.state === 'sending' ? ` · ${Math.round(item.progress * 100)}%` : ''}
            {item.attempts > 0 ? ` · ${item.attempts} attempt${item.attempts === 1 ? '' : 's'}` : ''}
          </AppText>
          {item.lastError && item.state !== 'sent' ? (
            <AppText variant="small" color={colors.textMuted} testID="outbox-error">
              {item.state === 'waiting' ? 'Will try again: ' : 'Reason: '}
              {item.lastError}
            </AppText>
          ) : null}
        </View>
      ) : null}
    </View>
  );
}

function OutboxGroupCard({ group }: { group: OutboxGroup }) {
  const [details, setDetails] = useState(false);
  const percent = Math.round(group.progress * 100);
  const queued = new Date(group.queuedAt).toISOString();
  return (
    <Card style={styles.group} testID={`outbox-group-${group.sessionId ?? 'new-client'}`}>
      <View style={styles.head}>
        <View style={styles.grow}>
          <AppText variant="bodyStrong" color={colors.ink} numberOfLines={1} testID="outbox-group-name">
            {group.clientName}
          </AppText>
          <AppText variant="caption" color={colors.textMuted}>
            {group.sessionId ? 'Session' : 'New client'} · {formatDate(queued)}, {formatTime(queued)}
          </AppText>
        </View>
        <Badge
          label={group.needsAttention ? 'Needs a look' : group.unsent === 0 ? 'Sent' : 'Waiting'}
          tone={group.needsAttention ? 'caution' : group.unsent === 0 ? 'good' : 'neutral'}
          testID="outbox-group-state"
        />
      </View>
      <AppText variant="small" color={colors.text} testID="outbox-group-progress">
        {groupProgressWords(group)}
      </AppText>
      <View
        style={styles.track}
        accessibilityRole="progressbar"
        accessibilityValue={{ min: 0, max: 100, now: percent }}
        testID="outbox-progress"
      >
        <View style={[styles.fill, { width: `${percent}%` }]} />
      </View>
      {group.items.map((item) => (
        <OutboxItemLine key={item.id} item={item} details={details} />
      ))}
      <Pressable
        accessibilityRole="button"
        accessibilityState={{ expanded: details }}
        onPress={() => setDetails((shown) => !shown)}
        testID="outbox-details-toggle"
        style={styles.toggle}
      >
        <AppText variant="smallStrong" color={colors.ink}>
          {details ? 'Hide details' : 'Details'}
        </AppText>
      </Pressable>
    </Card>
  );
}

/** The queue grouped by session, those still waiting first. */
export function OutboxList({ items }: { items: readonly OutboxRow[] }) {
  const groups = groupOutbox(items);
  const waiting = groups.filter((g) => g.unsent > 0).length;
  return (
    <View style={styles.list} testID="outbox-list">
      <AppText variant="caption" color={colors.textMuted} testID="outbox-summary">
        {waiting === 0 ? 'ALL SENT' : `${waiting} WAITING TO SEND`}
      </AppText>
      {groups.map((group) => (
        <OutboxGroupCard key={group.key} group={group} />
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
  group: { padding: space.md, gap: space.sm },
  item: { gap: space.xs, paddingTop: space.xs, borderTopWidth: 1, borderTopColor: colors.line },
  details: { gap: 2 },
  head: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.sm },
  grow: { flex: 1 },
  track: { height: 6, borderRadius: radii.pill, backgroundColor: colors.surfaceMuted, overflow: 'hidden' },
  fill: { height: 6, backgroundColor: colors.pulse },
  toggle: { alignSelf: 'flex-start', paddingVertical: space.xs, minHeight: 32, justifyContent: 'center' },
});
