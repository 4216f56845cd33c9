import type { OutboxRow } from '@/device/local-store/records';

/** The outbox as the operator reads it: one group per session (or per client for their details alone). */
export type OutboxGroup = {
  key: string;
  sessionId: string | null;
  clientName: string;
  /** When the first item of the group was queued (epoch ms). */
  queuedAt: number;
  items: OutboxRow[];
  recordings: { sent: number; total: number };
  /** Items not yet acknowledged by the clinic (waiting, sending, refused or in conflict). */
  unsent: number;
  /** 0..1 over every item, a clip counting by how far its upload has come. */
  progress: number;
  needsAttention: boolean;
};

const itemProgress = (item: OutboxRow) =>
  item.state === 'sent' ? 1 : item.state === 'sending' ? item.progress : 0;

/** Groups in the order to read them: those with something still to send first, then the newest first. */
export function groupOutbox(items: readonly OutboxRow[]): OutboxGroup[] {
  const groups = new Map<string, OutboxGroup>();
  for (const item of items) {
    const key = item.sessionId ? `session:${item.sessionId}` : `client:${item.clientId ?? item.rowId}`;
    let group = groups.get(key);
    if (!group) {
      group = {
        key,
        sessionId: item.sessionId,
        clientName: item.clientName?.trim() || 'A client',
        queuedAt: item.createdAt,
        items: [],
        recordings: { sent: 0, total: 0 },
        unsent: 0,
        progress: 0,
        needsAttention: false,
      };
      groups.set(key, group);
    }
    group.items.push(item);
    group.queuedAt = Math.min(group.queuedAt, item.createdAt);
    if (item.kind === 'clip') {
      group.recordings.total++;
      if (item.state === 'sent') group.recordings.sent++;
    }
    if (item.state !== 'sent') group.unsent++;
    if (item.state === 'failed' || item.state === 'conflict') group.needsAttention = true;
  }
  for (const group of groups.values()) {
    group.progress = group.items.reduce((sum, i) => sum + itemProgress(i), 0) / group.items.length;
    // Within a group too, what still waits comes first (a stable sort keeps the drain order).
    group.items.sort((a, b) => Number(a.state === 'sent') - Number(b.state === 'sent'));
  }
  return [...groups.values()].sort(
    (a, b) => Number(b.unsent > 0) - Number(a.unsent > 0) || b.queuedAt - a.queuedAt,
  );
}

/** "3 of 4 recordings sent", or for a group without recordings, how far its records are. */
export function groupProgressWords(group: OutboxGroup): string {
  if (group.recordings.total > 0) {
    const { sent, total } = group.recordings;
    return `${sent} of ${total} recording${total === 1 ? '' : 's'} sent`;
  }
  if (group.unsent === 0) return group.sessionId ? 'Session sent' : 'Client details sent';
  return group.sessionId ? 'Session records waiting to send' : 'Client details waiting to send';
}
