import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { ChoiceChips } from '@/ui/choice-chips';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDateTime } from '@/ui/format';
import { Pager } from '@/ui/pager';
import { Panel } from '@/ui/panel';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, QueryView } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useAuditQuery } from './api';
import { useTeamQuery } from '@/features/team/api';
import { useLayout } from '@/ui/use-layout';
import type { AuditEventRow } from '@/shared/protocol/practice';
import { AuditFilters, emptyAuditFilter, type AuditFilterValues } from './audit-filters';

const pageSize = 50;

function detailsText(details: AuditEventRow['details']): string {
  if (!details) return '';
  return Object.entries(details)
    .map(([k, v]) => `${k}: ${typeof v === 'object' ? JSON.stringify(v) : String(v)}`)
    .join(' · ');
}

const columns: readonly Column<AuditEventRow>[] = [
  {
    key: 'when',
    title: 'When',
    render: (e) => <Cell>{formatDateTime(e.occurredAt)}</Cell>,
  },
  {
    key: 'who',
    title: 'Who',
    render: (e) => <Cell strong>{e.userName ?? (e.userId ? 'removed user' : 'system')}</Cell>,
  },
  { key: 'action', title: 'Action', render: (e) => <Cell mono>{e.action}</Cell> },
  {
    key: 'entity',
    title: 'Entity',
    flex: 1.3,
    render: (e) => (
      <Cell muted>{e.entity ? `${e.entity}${e.entityId ? ` ${e.entityId.slice(0, 13)}` : ''}` : '—'}</Cell>
    ),
  },
  { key: 'ip', title: 'From', flex: 0.8, render: (e) => <Cell mono>{e.ip ?? '—'}</Cell> },
  {
    key: 'details',
    title: 'Details',
    flex: 1.6,
    render: (e) => <Cell muted>{detailsText(e.details) || '—'}</Cell>,
  },
];

/** Who read or changed what, when and from where. Read-only: nothing here edits an event. */
export function AuditScreen() {
  const { isWide } = useLayout();
  const team = useTeamQuery();
  const [filter, setFilter] = useState<AuditFilterValues>(emptyAuditFilter);
  const [action, setAction] = useState('all');
  const [userId, setUserId] = useState('all');
  const [page, setPage] = useState(1);
  const log = useAuditQuery({
    page,
    pageSize,
    action: action === 'all' ? undefined : action,
    userId: userId === 'all' ? undefined : userId,
    entity: filter.entity || undefined,
    entityId: filter.entityId || undefined,
    from: filter.from || undefined,
    to: filter.to || undefined,
  });

  const body = (
    <QueryView query={log} loading="Loading the audit log…" testID="audit">
      {(data) =>
        data.events.length === 0 ? (
          <EmptyState
            title="No events match"
            detail="Widen the dates or clear the filters."
            testID="audit-empty"
          />
        ) : (
          <>
            <DataTable
              rows={data.events}
              columns={columns}
              rowKey={(e) => e.id}
              rowTestID={(e) => `audit-row-${e.id}`}
              wide={isWide}
              testID="audit-table"
            />
            <Pager
              page={page}
              pageSize={pageSize}
              total={data.pageInfo.total}
              onPage={setPage}
              testID="audit-pager"
            />
          </>
        )
      }
    </QueryView>
  );

  const actions = log.data?.actions ?? [];
  return (
    <ScreenFrame
      title="Audit log"
      subtitle="Every sign-in, read of recordings or findings, change and export. Events cannot be changed."
      testID="audit-screen"
    >
      <Panel title="Filter">
        <View style={styles.group}>
          <AppText variant="smallStrong" color={colors.ink}>
            Action
          </AppText>
          <ChoiceChips
            label="Action"
            testID="audit-action"
            value={action}
            onChange={(a) => {
              setAction(a);
              setPage(1);
            }}
            choices={[{ value: 'all', label: 'All' }, ...actions.map((a) => ({ value: a, label: a }))]}
          />
        </View>
        <View style={styles.group}>
          <AppText variant="smallStrong" color={colors.ink}>
            Who
          </AppText>
          <ChoiceChips
            label="Who"
            testID="audit-user"
            value={userId}
            onChange={(u) => {
              setUserId(u);
              setPage(1);
            }}
            choices={[
              { value: 'all', label: 'Anyone' },
              ...(team.data?.users ?? []).map((u) => ({ value: u.id, label: u.name })),
            ]}
          />
        </View>
        <AuditFilters
          onApply={(values) => {
            setFilter(values);
            setPage(1);
          }}
        />
      </Panel>
      {body}
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({ group: { gap: space.xs } });
