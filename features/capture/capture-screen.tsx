import { useQueryClient } from '@tanstack/react-query';
import { router, useLocalSearchParams } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useHoldUpdates } from '@/features/root/app-update';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { CautionNote } from '@/ui/caution-note';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import {
  localKeys,
  useClinicKeyPrefetch,
  useDiscardSession,
  useFinishSession,
  useLocalClient,
  useLocalSession,
  useOutbox,
} from '@/device/local-store/queries';
import { keepTake, setCurrentSite, skipSite } from '@/device/local-store/sessions';
import type { SiteRecording } from '@/device/local-store/records';
import { useDeviceSync } from '@/device/sync/sync-context';
import { useLayout } from '@/ui/use-layout';
import { encodeWav16 } from '@/shared/analysis/wav';
import type { Site } from '@/shared/protocol';
import { CaptureStepper, nextOpenSite } from './capture-stepper';
import { DiscardSession } from './discard-session';
import { SessionSummary } from './session-summary';
import { SiteStep } from './site-step';
import type { TakeResult } from './use-take';

const contentMax = 720;

export function CaptureScreen() {
  const { sessionId } = useLocalSearchParams<{ sessionId: string }>();
  const id = String(sessionId ?? '');
  const loaded = useLocalSession(id);
  const client = useLocalClient(loaded.data?.session.clientId ?? '');
  const queryClient = useQueryClient();
  const finish = useFinishSession();
  const discard = useDiscardSession();
  const { width, isWide } = useLayout();
  const [saving, setSaving] = useState(false);
  useClinicKeyPrefetch();
  // A reload would lose the take on screen: a new version of the app waits until the session is sealed.
  useHoldUpdates(loaded.data?.session.status === 'in_progress');
  const [saveError, setSaveError] = useState<string | null>(null);
  const contentWidth = Math.min(contentMax, width - (isWide ? 320 : 32));

  if (loaded.isPending) return <LoadingState label="Opening the session…" testID="capture-loading" />;
  if (loaded.isError)
    return (
      <ErrorState
        message={loaded.error.message}
        onRetry={() => void loaded.refetch()}
        testID="capture-error"
      />
    );
  if (!loaded.data) {
    return (
      <ErrorState
        message="This session is not on this device. Sessions live on the device that recorded them until they sync."
        onRetry={() => router.replace('/clients')}
        testID="capture-missing"
      />
    );
  }
  const { session, recordings } = loaded.data;
  const who = client.data ? `${client.data.firstName} ${client.data.lastName}` : '';
  const refresh = () => queryClient.invalidateQueries({ queryKey: localKeys.session(id) });

  const run = async (task: () => Promise<void>) => {
    setSaving(true);
    setSaveError(null);
    try {
      await task();
      await refresh();
    } catch (error) {
      setSaveError(error instanceof Error ? error.message : 'Saving failed; nothing was lost. Try again.');
    } finally {
      setSaving(false);
    }
  };

  const after = (site: Site, next: SiteRecording[]) => nextOpenSite(next, site);
  const keep = (site: Site) => (result: TakeResult, note: string | null) =>
    void run(async () => {
      const settled = [...recordings.filter((r) => r.site !== site), { site } as SiteRecording];
      const wav = encodeWav16(result.pcm.samples, result.pcm.sampleRate);
      await keepTake({
        sessionId: id,
        site,
        source: result.source,
        wav,
        analysis: result.analysis,
        trace: result.trace,
        note,
        nextSite: after(site, settled),
      });
    });
  const skip = (site: Site) => (reason: string) =>
    void run(async () => {
      const settled = [...recordings.filter((r) => r.site !== site), { site } as SiteRecording];
      await skipSite({ sessionId: id, site, reason, nextSite: after(site, settled) });
    });
  const goTo = (site: Site | 'review') => void run(() => setCurrentSite(id, site));

  if (session.status === 'completed') {
    return (
      <ScreenFrame title="Session sealed" subtitle={who} testID="capture-finished">
        <View style={[styles.column, { maxWidth: contentMax }]}>
          <SealedSessionMessage sessionId={id} />
          <SessionSummary recordings={recordings} traceWidth={contentWidth - 28} />
          <CautionNote />
          <Button label="Open the outbox" onPress={() => router.push('/outbox')} testID="open-outbox" />
          <Button
            label="Back to the client"
            onPress={() => router.replace(`/clients/${session.clientId}`)}
            testID="back-to-client"
            variant="secondary"
          />
        </View>
      </ScreenFrame>
    );
  }

  const current = session.currentSite;
  const index = sites.findIndex((s) => s.id === current);
  const previous = index > 0 ? sites[index - 1]!.id : null;
  const recordedCount = recordings.filter((r) => r.outcome === 'recorded').length;

  return (
    <ScreenFrame
      title={current === 'review' ? 'Check and finish' : `Site ${index + 1} of 4`}
      subtitle={who}
      testID="capture-screen"
    >
      <View style={[styles.column, { maxWidth: contentMax }]}>
        <CaptureStepper current={current} recordings={recordings} onSelect={goTo} disabled={saving} />
        {current === 'review' ? (
          <View style={styles.review} testID="review">
            <SessionSummary recordings={recordings} traceWidth={contentWidth - 28} />
            {saveError || finish.error ? (
              <View style={styles.error} accessibilityRole="alert" testID="finish-error">
                <AppText variant="small" color={colors.danger}>
                  {saveError ?? finish.error?.message}
                </AppText>
              </View>
            ) : null}
            <CautionNote />
            <Button
              label={
                recordedCount === 0 ? 'Record at least one site to finish' : 'Finish and seal the session'
              }
              disabled={recordedCount === 0}
              busy={finish.isPending}
              onPress={() => finish.mutate(id)}
              testID="finish"
            />
            <Button
              label="Back to pulmonic"
              onPress={() => goTo('pulmonic')}
              testID="review-back"
              variant="ghost"
            />
          </View>
        ) : (
          <SiteStep
            key={current}
            site={current}
            defaultLengthS={session.clipSeconds}
            existing={recordings.find((r) => r.site === current)}
            width={contentWidth - 2}
            saving={saving}
            saveError={saveError}
            onKeep={keep(current)}
            onSkip={skip(current)}
            onBack={previous ? () => goTo(previous) : null}
          />
        )}
        <DiscardSession
          clientName={who}
          busy={discard.isPending}
          error={discard.error?.message ?? null}
          onDiscard={() =>
            discard.mutate(id, { onSuccess: () => router.replace(`/clients/${session.clientId}`) })
          }
        />
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  column: { width: '100%', gap: space.lg },
  review: { gap: space.md },
  error: { padding: space.md, borderRadius: radii.md, backgroundColor: colors.dangerSoft },
});

/** Where the sealed session stands, from its outbox items and the network. */
function SealedSessionMessage({ sessionId }: { sessionId: string }) {
  const { online } = useDeviceSync();
  const items = (useOutbox().data ?? []).filter((i) => i.sessionId === sessionId);
  const waiting = items.filter((i) => i.state !== 'sent').length;
  const text =
    items.length > 0 && waiting === 0
      ? 'The session reached the clinic.'
      : online
        ? 'The clips are sealed for the clinic and on their way; the outbox shows how far they are.'
        : 'The clips are sealed for the clinic and waiting in the outbox. They send themselves when the device is back online.';
  return (
    <AppText variant="body" color={colors.text} testID="finished-message">
      {text}
    </AppText>
  );
}
