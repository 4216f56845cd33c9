import { useLocalSearchParams, useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { Cell, DataTable, type Column } from '@/ui/data-table';
import { formatDate, formatTime } from '@/ui/format';
import { Panel } from '@/ui/panel';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { useClientRecordQuery } from '@/features/client-records/api';
import type { SessionStatus } from '@/shared/protocol';
import type { ClientRecord } from '@/shared/protocol/practice';
import { backTarget } from './back-target';
import { clientName } from './practitioner-clients-screen';
import { statusLabels } from './session-labels';

type Visit = ClientRecord['visits'][number];

function statusOf(visit: Visit) {
  return statusLabels[visit.status as SessionStatus] ?? { label: visit.status, tone: 'neutral' as const };
}

const visitColumns: readonly Column<Visit>[] = [
  {
    key: 'when',
    title: 'Visit',
    flex: 1.4,
    render: (v) => (
      <Cell strong>
        {formatDate(v.startedAt)} {formatTime(v.startedAt)}
      </Cell>
    ),
  },
  { key: 'status', title: 'Status', render: (v) => <Badge {...statusOf(v)} /> },
  { key: 'operator', title: 'Recorded by', render: (v) => <Cell>{v.operatorName ?? '—'}</Cell> },
  { key: 'sites', title: 'Sites recorded', render: (v) => <Cell figures>{v.sitesRecorded} of 4</Cell> },
  {
    key: 'follow',
    title: 'Follow-up',
    render: (v) => <Cell muted={!v.followUpDate}>{formatDate(v.followUpDate)}</Cell>,
  },
];

/** One client for the practitioner: their details, every visit (open one to review it) and their trends. */
export function PractitionerClientScreen() {
  const { clientId, from } = useLocalSearchParams<{ clientId: string; from?: string }>();
  const id = String(clientId);
  const router = useRouter();
  const { isWide } = useLayout();
  const record = useClientRecordQuery(id);
  const back = backTarget(from, id, 'clients');
  const backButton = (
    <Button
      label={back.label}
      variant="ghost"
      onPress={() => router.navigate(back.href)}
      testID="client-back"
    />
  );

  if (record.isPending)
    return (
      <ScreenFrame title="Client" testID="practitioner-client">
        <LoadingState label="Loading the client…" testID="client-loading" />
      </ScreenFrame>
    );
  if (record.isError)
    return (
      <ScreenFrame title="Client" testID="practitioner-client" header={backButton}>
        <ErrorState
          message={record.error.message}
          onRetry={() => void record.refetch()}
          testID="client-error"
        />
      </ScreenFrame>
    );

  const { client, visits } = record.data;
  const contact = [client.email, client.phone].filter(Boolean).join(' · ');
  return (
    <ScreenFrame
      title={clientName(client)}
      subtitle={`Born ${formatDate(client.dateOfBirth)} · ${client.visits} ${client.visits === 1 ? 'visit' : 'visits'}${contact ? ` · ${contact}` : ''}`}
      testID="practitioner-client"
      header={
        <View style={styles.row}>
          {backButton}
          <Button
            label="Trends across visits"
            variant="secondary"
            testID="client-open-trends"
            disabled={visits.length === 0}
            onPress={() =>
              router.push({
                pathname: '/review-clients/[clientId]/trends',
                params: { clientId: id, from: 'client' },
              })
            }
          />
          {client.nextFollowUp ? (
            <Badge label={`Next follow-up ${formatDate(client.nextFollowUp)}`} tone="neutral" />
          ) : null}
          {client.hasConsent ? null : <Badge label="No consent on file" tone="caution" />}
        </View>
      }
    >
      <Panel title="Visits" detail="Newest first. Open a visit to review it." testID="client-visit-list">
        {visits.length === 0 ? (
          <AppText color={colors.textMuted} testID="client-visit-list-empty">
            No visits recorded yet.
          </AppText>
        ) : (
          <DataTable
            rows={visits}
            columns={visitColumns}
            rowKey={(v) => v.sessionId}
            rowTestID={(v) => `client-visit-${v.sessionId}`}
            wide={isWide}
            testID="client-visit-table"
            onRowPress={(v) =>
              router.push({ pathname: '/sessions/[sessionId]', params: { sessionId: v.sessionId } })
            }
          />
        )}
      </Panel>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap', marginTop: space.xs },
});
