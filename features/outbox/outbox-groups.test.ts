import type { OutboxRow } from '@/device/local-store/records';
import { groupOutbox, groupProgressWords } from './outbox-groups';

let n = 0;
function item(patch: Partial<OutboxRow>): OutboxRow {
  n++;
  return {
    id: `item-${n}`,
    kind: 'mutation',
    entity: 'site_recordings',
    rowId: `row-${n}`,
    sizeBytes: 100,
    state: 'waiting',
    attempts: 0,
    nextAttemptAt: 0,
    progress: 0,
    createdAt: n,
    label: null,
    clientId: 'client-a',
    sessionId: 'session-a',
    clientName: 'Maren Okonkwo-Lind',
    site: null,
    ...patch,
  };
}

test('when a session has four recordings and three are sent, then its group says "3 of 4 recordings sent"', () => {
  const items = [
    item({ kind: 'clip', state: 'sent', progress: 1 }),
    item({ kind: 'clip', state: 'sent', progress: 1 }),
    item({ kind: 'clip', state: 'sent', progress: 1 }),
    item({ kind: 'clip', state: 'sending', progress: 0.5 }),
  ];
  const [group] = groupOutbox(items);
  expect(group!.clientName).toBe('Maren Okonkwo-Lind');
  expect(groupProgressWords(group!)).toBe('3 of 4 recordings sent');
  expect(group!.progress).toBeCloseTo(3.5 / 4);
  expect(group!.unsent).toBe(1);
});

test('when one session is all sent and a later and an earlier one wait, then waiting groups come first, newest first', () => {
  const items = [
    item({ sessionId: 'old-waiting', state: 'waiting', createdAt: 10 }),
    item({ sessionId: 'all-sent', state: 'sent', createdAt: 20 }),
    item({ sessionId: 'new-waiting', state: 'waiting', createdAt: 30 }),
    item({ sessionId: 'old-waiting', kind: 'clip', state: 'sent', createdAt: 11 }),
  ];
  expect(groupOutbox(items).map((g) => g.sessionId)).toEqual(['new-waiting', 'old-waiting', 'all-sent']);
});

test('when a client was added without a session, then their details form a group of their own', () => {
  const [group] = groupOutbox([item({ entity: 'clients', sessionId: null, state: 'waiting' })]);
  expect(group!.sessionId).toBeNull();
  expect(groupProgressWords(group!)).toBe('Client details waiting to send');
});

test('when an item was refused, then its group needs the operator’s attention', () => {
  const [group] = groupOutbox([item({ state: 'failed', lastError: 'Refused.' })]);
  expect(group!.needsAttention).toBe(true);
});

test('when some items of a session are sent, then those still waiting are listed first', () => {
  const [group] = groupOutbox([
    item({ state: 'sent', label: 'first' }),
    item({ state: 'waiting', label: 'second' }),
  ]);
  expect(group!.items.map((i) => i.label)).toEqual(['second', 'first']);
});
