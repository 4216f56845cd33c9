import { useState } from 'react';
import { View } from 'react-native';
import { ChoiceChips } from '@/ui/choice-chips';
import { Panel } from '@/ui/panel';
import { ScreenFrame } from '@/ui/screen-frame';
import { PagedQueryView } from '@/ui/state-views';
import { useSettingsQuery } from '@/features/settings/api';
import { useTeamQuery } from '@/features/team/api';
import { useAuditQuery } from './api';
import { AuditEventItem } from './audit-event-item';
import { AuditFilters, emptyAuditFilter, type AuditFilterValues } from './audit-filters';
import { auditKinds } from './audit-words';

const pageSize = 50;

/** Who read or changed what, when and from where. Read-only: nothing here edits an event. */
export function AuditScreen() {
  const team = useTeamQuery();
  const settings = useSettingsQuery();
  const [filter, setFilter] = useState<AuditFilterValues>(emptyAuditFilter);
  const [action, setAction] = useState('all');
  const [userId, setUserId] = useState('all');
  const [page, setPage] = useState(1);
  const log = useAuditQuery({
    page,
    pageSize,
    action: action === 'all' ? undefined : action,
    userId: userId === 'all' ? undefined : userId,
    client: filter.client || undefined,
    from: filter.from || undefined,
    to: filter.to || undefined,
  });

  const body = (
    <PagedQueryView
      query={log}
      loading="Loading the audit log…"
      testID="audit"
      empty={{
        when: (data) => data.events.length === 0,
        title: 'No events match',
        detail: 'Widen the dates or clear the filters.',
      }}
      onPage={setPage}
    >
      {(data) => (
        <View testID="audit-table">
          {data.events.map((e) => (
            <AuditEventItem key={e.id} event={e} currency={settings.data?.currency ?? null} />
          ))}
        </View>
      )}
    </PagedQueryView>
  );

  return (
    <ScreenFrame
      title="Audit log"
      subtitle="Who signed in, opened, changed or sent what, and when. Nothing here can be changed or removed."
      testID="audit-screen"
    >
      <Panel title="Filter">
        <ChoiceChips
          label="Kind"
          showLabel
          testID="audit-action"
          value={action}
          onChange={(a) => {
            setAction(a);
            setPage(1);
          }}
          choices={[{ value: 'all', label: 'Everything' }, ...auditKinds]}
        />
        <ChoiceChips
          label="Who"
          showLabel
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
