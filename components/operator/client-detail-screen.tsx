import { router, useLocalSearchParams } from 'expo-router';
import { useEffect, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ConsentForm } from '@/components/capture/consent-form';
import { useClinicConsentText } from '@/hooks/consent/clinic-consent-text';
import { AppText } from '@/components/ui/app-text';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { formatDate } from '@/components/ui/format';
import { ScreenFrame } from '@/components/ui/screen-frame';
import { ErrorState, LoadingState } from '@/components/ui/state-views';
import { colors, radii, space } from '@/constants/theme';
import { useClientsQuery } from '@/hooks/data/clients';
import { rememberServerClient, rememberServerConsent } from '@/hooks/local-store/clients';
import {
  useClientSessions,
  useClinicKeyPrefetch,
  useCurrentConsent,
  useLocalClient,
  useRecordConsent,
  useStartSession,
} from '@/hooks/local-store/queries';

export function ClientDetailScreen() {
  const { clientId } = useLocalSearchParams<{ clientId: string }>();
  const id = String(clientId ?? '');
  const local = useLocalClient(id);
  const server = useClientsQuery('');
  const consentTextShown = useClinicConsentText();
  const consent = useCurrentConsent(id, String(consentTextShown.version));
  const sessions = useClientSessions(id);
  const record = useRecordConsent();
  const start = useStartSession();
  const [error, setError] = useState<string | null>(null);
  useClinicKeyPrefetch();

  // A client known only from the clinic list is copied to the device so it can be recorded offline.
  const fromServer = server.data?.find((c) => c.id === id);
  useEffect(() => {
    if (local.data === null && fromServer) {
      void rememberServerClient({ ...fromServer, version: 0 }).then(() => local.refetch());
    }
  }, [local, fromServer]);
  // Consent the clinic already holds is kept on the device too, so it is not asked again (nor sent back). Only
  // one to the text in force counts, and only while the device has none of its own: without these checks every
  // refresh of the clinic list would write it again.
  const serverConsent = fromServer?.consent ?? null;
  const needsServerConsent =
    local.data !== null &&
    local.data !== undefined &&
    serverConsent !== null &&
    String(serverConsent.textVersion) === String(consentTextShown.version) &&
    consent.data === null;
  const { refetch: refetchConsent } = consent;
  useEffect(() => {
    if (needsServerConsent && serverConsent) {
      void rememberServerConsent(id, serverConsent).then(() => refetchConsent());
    }
  }, [id, needsServerConsent, serverConsent, refetchConsent]);

  if (local.isPending) return <LoadingState label="Opening the client…" testID="client-loading" />;
  if (local.isError)
    return (
      <ErrorState message={local.error.message} onRetry={() => void local.refetch()} testID="client-error" />
    );
  if (!local.data) {
    if (server.isPending) return <LoadingState label="Opening the client…" testID="client-loading" />;
    return (
      <ErrorState
        message="This client is not on this device yet. Open them once while online."
        onRetry={() => router.replace('/clients')}
        testID="client-missing"
      />
    );
  }
  const client = local.data;
  const name = `${client.firstName} ${client.lastName}`;
  const open = sessions.data?.find((s) => s.status === 'in_progress');
  const done = sessions.data?.filter((s) => s.status === 'completed') ?? [];

  const begin = async () => {
    if (!consent.data) return;
    setError(null);
    try {
      const session = await start.mutateAsync({ clientId: id, consentId: consent.data.id });
      router.push(`/capture/${session.id}`);
    } catch (e) {
      setError(e instanceof Error ? e.message : 'The session could not be started.');
    }
  };

  return (
    <ScreenFrame
      title={name}
      subtitle={client.dateOfBirth ? `born ${formatDate(client.dateOfBirth)}` : 'date of birth not given'}
      testID="client-detail"
    >
      <View style={styles.column}>
        {error ? (
          <View style={styles.error} accessibilityRole="alert" testID="client-detail-error">
            <AppText variant="small" color={colors.danger}>
              {error}
            </AppText>
          </View>
        ) : null}
        {consent.isPending ? null : consent.data ? (
          <View style={styles.card} testID="consent-on-file">
            <Badge label="Consent on file" tone="good" />
            <AppText variant="small" color={colors.text}>
              Signed by {consent.data.signedName} on {formatDate(consent.data.signedOn)} (text{' '}
              {consent.data.textVersion}).
            </AppText>
          </View>
        ) : (
          <View style={styles.card} testID="consent-needed">
            <Badge label="Consent needed before recording" tone="caution" />
            <ConsentForm
              text={consentTextShown}
              clientName={name}
              onSubmit={async (values) => {
                setError(null);
                try {
                  await record.mutateAsync({ clientId: id, ...values });
                } catch (e) {
                  setError(e instanceof Error ? e.message : 'Consent could not be saved; try again.');
                }
              }}
            />
          </View>
        )}
        {open ? (
          <Button
            label="Resume the open session"
            onPress={() => router.push(`/capture/${open.id}`)}
            testID="resume-session"
          />
        ) : (
          <Button
            label={consent.data ? 'Start a session' : 'Record consent to start a session'}
            onPress={() => void begin()}
            disabled={!consent.data}
            busy={start.isPending}
            testID="start-session"
          />
        )}
        {done.length > 0 ? (
          <View style={styles.card} testID="past-sessions">
            <AppText variant="smallStrong" color={colors.ink}>
              Sessions on this device
            </AppText>
            {done.map((s) => (
              <Button
                key={s.id}
                label={`${formatDate(s.startedAt)} · sealed`}
                variant="secondary"
                onPress={() => router.push(`/capture/${s.id}`)}
                testID={`session-${s.id}`}
              />
            ))}
          </View>
        ) : null}
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  column: { maxWidth: 640, width: '100%', gap: space.lg },
  card: {
    padding: space.lg,
    gap: space.md,
    backgroundColor: colors.surface,
    borderRadius: radii.lg,
    borderWidth: 1,
    borderColor: colors.line,
  },
  error: { padding: space.md, borderRadius: radii.md, backgroundColor: colors.dangerSoft },
});
