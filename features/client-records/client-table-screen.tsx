import { useLocalSearchParams } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { Badge } from '@/ui/badge';
import { Cell, type Column } from '@/ui/data-table';
import { formatDate } from '@/ui/format';
import { space } from '@/ui/theme';
import type { ClientRow } from '@/shared/protocol/practice';
import { ClientDirectory } from './client-directory';

const columns: readonly Column<ClientRow>[] = [
  {
    key: 'name',
    title: 'Name',
    flex: 2,
    sortKey: 'name',
    render: (c) => (
      <Cell strong>
        {c.lastName}, {c.firstName}
      </Cell>
    ),
  },
  {
    key: 'dob',
    title: 'Born',
    sortKey: 'dateOfBirth',
    render: (c) => <Cell>{formatDate(c.dateOfBirth)}</Cell>,
  },
  {
    key: 'contact',
    title: 'Contact',
    flex: 2,
    render: (c) => <Cell muted>{[c.email, c.phone].filter(Boolean).join(' · ') || '—'}</Cell>,
  },
  { key: 'visits', title: 'Visits', flex: 0.6, render: (c) => <Cell figures>{c.visits}</Cell> },
  {
    key: 'last',
    title: 'Last visit',
    sortKey: 'lastVisit',
    render: (c) => <Cell>{formatDate(c.lastVisit)}</Cell>,
  },
  { key: 'next', title: 'Follow-up', render: (c) => <Cell>{formatDate(c.nextFollowUp)}</Cell> },
  {
    key: 'keep',
    title: 'Keep until',
    sortKey: 'keepUntil',
    render: (c) =>
      c.retentionDue ? (
        <View style={styles.keep} testID={`client-retention-due-${c.id}`}>
          <Cell>{formatDate(c.keepUntil)}</Cell>
          <Badge label="past retention: review" tone="caution" />
        </View>
      ) : (
        <Cell muted>{formatDate(c.keepUntil)}</Cell>
      ),
  },
  {
    key: 'consent',
    title: 'Consent',
    render: (c) =>
      c.hasConsent ? <Badge label="on file" tone="good" /> : <Badge label="missing" tone="caution" />,
  },
];

/** Every client of the clinic: search by name, e-mail or phone, sort by a column, page through. */
export function ClientTableScreen() {
  // The overview links here with ?retention=due.
  const params = useLocalSearchParams<{ retention?: string }>();
  return (
    <ClientDirectory
      title="Clients"
      subtitle="Records, consent and visits of every client; open one to edit, export or erase it."
      screenTestID="client-table-screen"
      testID="client-table"
      tableTestID="client-table"
      rowTestID={(c) => `client-record-row-${c.id}`}
      columns={columns}
      sortChoices={[
        { value: 'name', label: 'Name' },
        { value: 'dateOfBirth', label: 'Born' },
        { value: 'lastVisit', label: 'Last visit' },
        { value: 'keepUntil', label: 'Keep until' },
      ]}
      open={(c) => ({ pathname: '/client-records/[clientId]', params: { clientId: c.id } })}
      retention={params.retention === 'due' ? 'due' : 'all'}
    />
  );
}

const styles = StyleSheet.create({
  keep: { gap: space.xs, alignItems: 'flex-start' },
});
