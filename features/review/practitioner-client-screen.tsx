import { useLocalSearchParams, useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { formatDate } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { useClientRecordQuery } from '@/features/client-records/api';
import { VisitHistory } from '@/features/client-records/client-history';
import { backTarget } from './back-target';
import { clientName } from './practitioner-clients-screen';

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
      <VisitHistory
        visits={visits}
        wide={isWide}
        detail="Newest first. Open a visit to review it."
        onOpen={(v) => router.push({ pathname: '/sessions/[sessionId]', params: { sessionId: v.sessionId } })}
      />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap', marginTop: space.xs },
});
