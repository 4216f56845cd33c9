import { useLocalSearchParams, useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { formatDate } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import {
  downloadClientExport,
  useClientRecordQuery,
  useEraseClientMutation,
  useUpdateClientMutation,
} from './api';
import { useLayout } from '@/ui/use-layout';
import type { EraseClientResponse } from '@/shared/protocol/practice';
import { ClientDetailsForm } from './client-details-form';
import { ConsentHistory, PackageList, VisitHistory } from './client-history';
import { ErasePanel, ErasureResult } from './erase-panel';

function ExportButton({ clientId }: { clientId: string }) {
  const [state, setState] = useState<{ kind: 'idle' | 'busy' | 'done' } | { kind: 'error'; message: string }>(
    {
      kind: 'idle',
    },
  );
  return (
    <View style={styles.exportRow}>
      <Button
        label="Export (zip)"
        variant="secondary"
        busy={state.kind === 'busy'}
        testID="client-export"
        onPress={() => {
          setState({ kind: 'busy' });
          downloadClientExport(clientId).then(
            () => setState({ kind: 'done' }),
            (error: unknown) =>
              setState({
                kind: 'error',
                message: error instanceof Error ? error.message : 'The export failed.',
              }),
          );
        }}
      />
      {state.kind === 'done' ? (
        <AppText variant="small" color={colors.pulse} testID="client-export-done">
          Downloaded: records and measurements as CSV, clips as WAV, and the reports.
        </AppText>
      ) : state.kind === 'error' ? (
        <AppText variant="small" color={colors.danger} testID="client-export-error">
          {state.message}
        </AppText>
      ) : null}
    </View>
  );
}

/** One client's record for the admin: details, visits, consent, packages; export and erasure. */
export function ClientRecordScreen() {
  const { clientId } = useLocalSearchParams<{ clientId: string }>();
  const id = String(clientId);
  const router = useRouter();
  const { isWide } = useLayout();
  const [erased, setErased] = useState<{ name: string; result: EraseClientResponse } | null>(null);
  const record = useClientRecordQuery(id);
  const update = useUpdateClientMutation(id);
  const erase = useEraseClientMutation(id);
  const back = () => router.navigate('/client-records');

  if (erased) {
    return (
      <ScreenFrame title="Client erased" testID="client-record-screen">
        <ErasureResult result={erased.result} onBack={back} />
      </ScreenFrame>
    );
  }

  if (record.isPending) {
    return (
      <ScreenFrame title="Client" testID="client-record-screen">
        <LoadingState label="Loading the record…" testID="client-record-loading" />
      </ScreenFrame>
    );
  }
  if (record.isError) {
    return (
      <ScreenFrame title="Client" testID="client-record-screen">
        <ErrorState
          message={record.error.message}
          onRetry={() => void record.refetch()}
          testID="client-record-error"
        />
        <View style={styles.row}>
          <Button label="Back to clients" variant="secondary" onPress={back} testID="client-record-back" />
        </View>
      </ScreenFrame>
    );
  }

  const { client, visits, consents, packages } = record.data;
  const fullName = `${client.firstName} ${client.lastName}`;
  return (
    <ScreenFrame
      title={fullName}
      subtitle={`Born ${formatDate(client.dateOfBirth)} · ${client.visits} ${client.visits === 1 ? 'visit' : 'visits'} · client since ${formatDate(client.createdAt)}`}
      testID="client-record-screen"
      header={
        <View style={styles.row}>
          <Button label="← All clients" variant="ghost" onPress={back} testID="client-record-back" />
          <View>
            {client.hasConsent ? (
              <Badge label="consent on file" tone="good" />
            ) : (
              <Badge label="no consent" tone="caution" />
            )}
          </View>
          <View testID="client-record-retention">
            {client.retentionDue ? (
              <Badge label={`past retention since ${formatDate(client.keepUntil)}: review`} tone="caution" />
            ) : (
              <Badge label={`keep until ${formatDate(client.keepUntil)}`} tone="neutral" />
            )}
          </View>
          <ExportButton clientId={id} />
        </View>
      }
    >
      <ClientDetailsForm
        key={client.id}
        client={client}
        onSave={(input) => update.mutateAsync(input)}
        onReload={async () => (await record.refetch()).data}
      />
      <View style={[styles.columns, isWide && styles.columnsWide]}>
        <View style={styles.column}>
          <ConsentHistory consents={consents} />
        </View>
        <View style={styles.column}>
          <PackageList packages={packages} />
        </View>
      </View>
      <VisitHistory visits={visits} wide={isWide} detail="Every recorded session, newest first." practice />
      <ErasePanel
        fullName={fullName}
        onErase={(typed) => erase.mutateAsync(typed)}
        onDone={(result) => setErased({ name: fullName, result })}
      />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap', marginTop: space.xs },
  exportRow: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  columns: { gap: space.lg },
  columnsWide: { flexDirection: 'row', alignItems: 'flex-start' },
  column: { flex: 1, minWidth: 0 },
});
