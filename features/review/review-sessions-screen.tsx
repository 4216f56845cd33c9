import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { CautionNote } from '@/ui/caution-note';
import { Pager } from '@/ui/pager';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { useReviewSessionsQuery, type SessionFilters } from './api';
import { SessionFiltersBar, useSessionFilters } from './session-filters';
import { SessionsTable } from './sessions-table';
import { useCursorPages, useSessionSort } from './table-state';

const PAGE = 25;

/** The practitioner's table of synced sessions: server-paged, sorted and filtered. */
export function ReviewSessionsScreen({ testID = 'review-sessions' }: { testID?: string }) {
  const { isWide } = useLayout();
  const filterState = useSessionFilters();
  const { sort, onSort } = useSessionSort();
  const filters: SessionFilters = { ...filterState.filters, sort: sort.key, dir: sort.dir };
  const pages = useCursorPages(JSON.stringify(filters));
  const page = useReviewSessionsQuery(filters, pages.cursor, PAGE);

  let body;
  if (page.isPending) body = <LoadingState label="Loading sessions…" testID="sessions-loading" />;
  else if (page.isError)
    body = (
      <ErrorState message={page.error.message} onRetry={() => void page.refetch()} testID="sessions-error" />
    );
  else if (page.data.sessions.length === 0)
    body = (
      <EmptyState
        title="No sessions match"
        detail="Change or clear the filters; new sessions appear once a device has synced them."
        testID="sessions-empty"
      />
    );
  else {
    const nextCursor = page.data.nextCursor;
    body = (
      <>
        <SessionsTable
          rows={page.data.sessions}
          wide={isWide}
          sort={sort}
          onSort={onSort}
          onClient={filterState.set.setClient}
          onOperator={filterState.set.setOperator}
        />
        <View style={styles.pager}>
          <Pager
            page={pages.page}
            pageSize={PAGE}
            total={page.data.total}
            onPage={(to) => (to < pages.page ? pages.back() : nextCursor && pages.forward(nextCursor))}
            testID="sessions"
          />
          {page.isFetching ? (
            <AppText variant="caption" color={colors.textMuted}>
              updating…
            </AppText>
          ) : null}
        </View>
      </>
    );
  }

  return (
    <ScreenFrame
      title="Sessions"
      subtitle="Synced sessions from the clinic's devices. Open one to review it."
      testID={testID}
      header={<SessionFiltersBar state={filterState} wide={isWide} />}
    >
      <CautionNote compact />
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  pager: { gap: space.xs },
});
