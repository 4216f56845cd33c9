import { router, useLocalSearchParams } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ConsentForm } from '@/features/capture/consent-form';
import { useClinicConsentText } from '@/device/consent/clinic-consent-text';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { formatDate } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { colors, radii, space } from '@/ui/theme';
import {
  useClientSessions,
  useClinicKeyPrefetch,
  useCurrentConsent,
  useLocalClient,
  useRecordConsent,
  useStartSession,
} from '@/device/local-store/queries';

export function ClientDetailScreen() {
  const { clientId } = useLocalSearchParams<{ clientId: string }>();
  const id = String(clientId ?? '');
  const local = useLocalClient(id);
  const consentTextShown = useClinicConsentText();
  const consent = useCurrentConsent(id, String(consentTextShown.version));
  const sessions = useClientSessions(id);
  const record = useRecordConsent();
  const start = useStartSession();
  const [error, setError] = useState<string | null>(null);
  useClinicKeyPrefetch();

  if (local.isPending) return <LoadingState label="Opening the client…" testID="client-loading" />;
  if (local.isError)
    return (
      <ErrorState message={local.error.message} onRetry={() => void local.refetch()} testID="client-error" />
    );
  if (!local.data)
    return (
      <EmptyState
        title="Not on this phone"
        detail="This client is not kept on this phone: the clinic may have erased them, or they arrive with the next sync."
        testID="client-missing"
      />
    );
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
              Signed by {consent.data.signedName} on {formatDate(consent.data.signedOn)} to the consent
              wording in force (version {consent.data.textVersion}).
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
