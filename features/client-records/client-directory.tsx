import { useRouter, type Href } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { ChoiceChips, type Choice } from '@/ui/choice-chips';
import { DataTable, type Column } from '@/ui/data-table';
import { ScreenFrame } from '@/ui/screen-frame';
import { SearchField } from '@/ui/search-field';
import { PagedQueryView } from '@/ui/state-views';
import { space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import type { ClientRow, ClientTableQuery } from '@/shared/protocol/practice';
import { useClientTableQuery } from './api';
import { useClientSearch, type Retention } from './client-search';

const pageSize = 20;

type Props = {
  title: string;
  subtitle: string;
  /** The screen's test id; `testID` prefixes its parts (`-search`, `-sort`, `-empty`, `-pager`). */
  screenTestID: string;
  testID: string;
  tableTestID: string;
  rowTestID: (client: ClientRow) => string;
  columns: readonly Column<ClientRow>[];
  /** The sort choices a phone shows as chips (a wide table sorts by its column heads). */
  sortChoices: readonly Choice<ClientTableQuery['sort']>[];
  /** Where a row leads. */
  open: (client: ClientRow) => Href;
  /** Offer "Past retention" beside "All clients", starting with this one; without it every client is listed. */
  retention?: Retention;
};

/** The clinic's clients, searched by name, e-mail or phone, sorted by a column and paged: one list for every role. */
export function ClientDirectory({
  title,
  subtitle,
  screenTestID,
  testID,
  tableTestID,
  rowTestID,
  columns,
  sortChoices,
  open,
  retention: initialRetention,
}: Props) {
  const router = useRouter();
  const { isWide } = useLayout();
  const { search, setSearch, q, sort, onSort, retention, setRetention, page, setPage } =
    useClientSearch(initialRetention);
  const table = useClientTableQuery({
    page,
    pageSize,
    q: q || undefined,
    sort: sort.key,
    dir: sort.dir,
    retention: initialRetention ? retention : undefined,
  });
  const empty =
    retention === 'due'
      ? {
          title: 'Nothing past retention',
          detail: "No client's records are older than the clinic's retention period (Settings).",
        }
      : q
        ? {
            title: 'No match',
            detail: `No client matches “${q}”. Try part of the name, the e-mail or the phone number.`,
          }
        : { title: 'No clients yet', detail: 'Clients added on the phones appear here.' };

  return (
    <ScreenFrame
      title={title}
      subtitle={subtitle}
      testID={screenTestID}
      header={
        <View style={styles.tools}>
          <View style={styles.search}>
            <SearchField
              value={search}
              onChangeText={setSearch}
              placeholder="Search by name, e-mail or phone"
              label="Search clients"
              testID={`${testID}-search`}
            />
          </View>
          {initialRetention ? (
            <ChoiceChips
              label="Show"
              testID={`${testID}-retention`}
              value={retention}
              onChange={setRetention}
              choices={[
                { value: 'all', label: 'All clients' },
                { value: 'due', label: 'Past retention' },
              ]}
            />
          ) : null}
          {!isWide ? (
            <ChoiceChips
              label="Sort by"
              testID={`${testID}-sort`}
              value={sort.key}
              onChange={(key) => onSort(key)}
              choices={sortChoices}
            />
          ) : null}
        </View>
      }
    >
      <PagedQueryView
        query={table}
        loading="Loading clients…"
        testID={testID}
        empty={{ when: (data) => data.clients.length === 0, ...empty }}
        onPage={setPage}
      >
        {(data) => (
          <DataTable
            rows={data.clients}
            columns={columns}
            rowKey={(c) => c.id}
            rowTestID={rowTestID}
            wide={isWide}
            testID={tableTestID}
            sort={sort}
            onSort={onSort}
            onRowPress={(c) => router.push(open(c))}
          />
        )}
      </PagedQueryView>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  search: { flexDirection: 'row', flexGrow: 1, flexBasis: 300, maxWidth: 520 },
  tools: { flexDirection: 'row', alignItems: 'center', gap: space.md, marginTop: space.sm, flexWrap: 'wrap' },
});
