import { useLocalSearchParams, useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Badge } from '@/ui/badge';
import { ChoiceChips } from '@/ui/choice-chips';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate } from '@/ui/format';
import { Pager } from '@/ui/pager';
import { ScreenFrame } from '@/ui/screen-frame';
import { SearchField } from '@/ui/search-field';
import { EmptyState, QueryView } from '@/ui/state-views';
import { space } from '@/ui/theme';
import { useClientTableQuery } from './api';
import { useClientSearch } from './client-search';
import { useLayout } from '@/ui/use-layout';
import type { ClientRow, ClientTableQuery } from '@/shared/protocol/practice';

const pageSize = 20;
type Retention = ClientTableQuery['retention'];

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
  const router = useRouter();
  const { isWide } = useLayout();
  const { search, setSearch, q, sort, onSort, page, setPage } = useClientSearch();
  // The overview links here with ?retention=due.
  const params = useLocalSearchParams<{ retention?: string }>();
  const [retention, setRetention] = useState<Retention>(params.retention === 'due' ? 'due' : 'all');
  const table = useClientTableQuery({
    page,
    pageSize,
    q: q || undefined,
    sort: sort.key,
    dir: sort.dir,
    retention,
  });

  const body = (
    <QueryView query={table} loading="Loading clients…" testID="client-table">
      {(data) =>
        data.clients.length === 0 ? (
          retention === 'due' ? (
            <EmptyState
              title="Nothing past retention"
              detail="No client's records are older than the clinic's retention period (Settings)."
              testID="client-table-empty"
            />
          ) : q ? (
            <EmptyState
              title="No match"
              detail={`No client matches “${q}”. Try part of the name, the e-mail or the phone number.`}
              testID="client-table-empty"
            />
          ) : (
            <EmptyState
              title="No clients yet"
              detail="Clients added on the phones appear here."
              testID="client-table-empty"
            />
          )
        ) : (
          <>
            <DataTable
              rows={data.clients}
              columns={columns}
              rowKey={(c) => c.id}
              rowTestID={(c) => `client-record-row-${c.id}`}
              wide={isWide}
              testID="client-table"
              sort={sort}
              onSort={onSort}
              onRowPress={(c) =>
                router.push({ pathname: '/client-records/[clientId]', params: { clientId: c.id } })
              }
            />
            <Pager
              page={data.pageInfo.page}
              pageSize={pageSize}
              total={data.pageInfo.total}
              onPage={setPage}
              testID="client-table-pager"
            />
          </>
        )
      }
    </QueryView>
  );

  return (
    <ScreenFrame
      title="Clients"
      subtitle="Records, consent and visits of every client; open one to edit, export or erase it."
      testID="client-table-screen"
      header={
        <View style={styles.tools}>
          <View style={styles.search}>
            <SearchField
              value={search}
              onChangeText={setSearch}
              placeholder="Search by name, e-mail or phone"
              label="Search clients"
              testID="client-table-search"
            />
          </View>
          <ChoiceChips
            label="Show"
            testID="client-table-retention"
            value={retention}
            onChange={(value) => {
              setRetention(value);
              setPage(1);
            }}
            choices={[
              { value: 'all', label: 'All clients' },
              { value: 'due', label: 'Past retention' },
            ]}
          />
          {!isWide ? (
            <ChoiceChips
              label="Sort by"
              testID="client-table-sort"
              value={sort.key}
              onChange={(key) => onSort(key)}
              choices={[
                { value: 'name', label: 'Name' },
                { value: 'dateOfBirth', label: 'Born' },
                { value: 'lastVisit', label: 'Last visit' },
                { value: 'keepUntil', label: 'Keep until' },
              ]}
            />
          ) : null}
        </View>
      }
    >
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  search: { flexDirection: 'row', flexGrow: 1, flexBasis: 300, maxWidth: 520 },
  keep: { gap: space.xs, alignItems: 'flex-start' },
  tools: { flexDirection: 'row', alignItems: 'center', gap: space.md, marginTop: space.sm, flexWrap: 'wrap' },
});
