import { useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { ChoiceChips } from '@/ui/choice-chips';
import { ClippedText } from '@/ui/clipped-text';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate } from '@/ui/format';
import { Pager } from '@/ui/pager';
import { ScreenFrame } from '@/ui/screen-frame';
import { SearchField } from '@/ui/search-field';
import { EmptyState, QueryView } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { useClientTableQuery } from '@/features/client-records/api';
import { useClientSearch } from '@/features/client-records/client-search';
import type { ClientRow } from '@/shared/protocol/practice';

const pageSize = 20;

export const clientName = (c: { firstName: string; lastName: string }) => `${c.firstName} ${c.lastName}`;

const columns: readonly Column<ClientRow>[] = [
  {
    key: 'name',
    title: 'Client',
    flex: 2,
    sortKey: 'name',
    render: (c) => (
      <ClippedText
        text={clientName(c)}
        lines={2}
        variant="smallStrong"
        color={colors.ink}
        testID={`clients-name-${c.id}`}
      />
    ),
  },
  {
    key: 'dob',
    title: 'Born',
    sortKey: 'dateOfBirth',
    render: (c) => <Cell>{formatDate(c.dateOfBirth)}</Cell>,
  },
  { key: 'visits', title: 'Visits', flex: 0.6, render: (c) => <Cell figures>{c.visits}</Cell> },
  {
    key: 'last',
    title: 'Last visit',
    sortKey: 'lastVisit',
    render: (c) => <Cell>{formatDate(c.lastVisit)}</Cell>,
  },
  {
    key: 'next',
    title: 'Next follow-up',
    render: (c) => <Cell muted={!c.nextFollowUp}>{formatDate(c.nextFollowUp)}</Cell>,
  },
];

/** The practitioner's clients: find one by name, e-mail or phone, then open their visits and trends. */
export function PractitionerClientsScreen() {
  const router = useRouter();
  const { isWide } = useLayout();
  const { search, setSearch, q, sort, onSort, page, setPage } = useClientSearch();
  const table = useClientTableQuery({ page, pageSize, q: q || undefined, sort: sort.key, dir: sort.dir });

  const body = (
    <QueryView query={table} loading="Loading clients…" testID="clients">
      {(data) =>
        data.clients.length === 0 ? (
          q ? (
            <EmptyState
              title="No match"
              detail={`No client matches “${q}”. Try part of the name, the e-mail or the phone number.`}
              testID="clients-empty"
            />
          ) : (
            <EmptyState
              title="No clients yet"
              detail="Clients added on the phones appear here."
              testID="clients-empty"
            />
          )
        ) : (
          <>
            <DataTable
              rows={data.clients}
              columns={columns}
              rowKey={(c) => c.id}
              rowTestID={(c) => `clients-row-${c.id}`}
              wide={isWide}
              testID="clients-table"
              sort={sort}
              onSort={onSort}
              onRowPress={(c) =>
                router.push({ pathname: '/review-clients/[clientId]', params: { clientId: c.id } })
              }
            />
            <Pager
              page={data.pageInfo.page}
              pageSize={pageSize}
              total={data.pageInfo.total}
              onPage={setPage}
              testID="clients-pager"
            />
          </>
        )
      }
    </QueryView>
  );

  return (
    <ScreenFrame
      title="Clients"
      subtitle="Find a client to see their visits and how their measurements change over time."
      testID="practitioner-clients"
      header={
        <View style={styles.tools}>
          <View style={styles.search}>
            <SearchField
              value={search}
              onChangeText={setSearch}
              placeholder="Search by name, e-mail or phone"
              label="Search clients"
              testID="clients-search"
            />
          </View>
          {!isWide ? (
            <ChoiceChips
              label="Sort by"
              testID="clients-sort"
              value={sort.key}
              onChange={(key) => onSort(key)}
              choices={[
                { value: 'name', label: 'Name' },
                { value: 'lastVisit', label: 'Last visit' },
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
  tools: { flexDirection: 'row', alignItems: 'center', gap: space.md, marginTop: space.sm, flexWrap: 'wrap' },
});
