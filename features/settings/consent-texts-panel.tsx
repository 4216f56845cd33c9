import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { FormTextField } from '@/ui/form-text-field';
import { formatDate } from '@/ui/format';
import { Panel } from '@/ui/panel';
import { QueryView } from '@/ui/state-views';
import { ConfirmStep } from '@/ui/confirm-step';
import { colors, radii, space } from '@/ui/theme';
import { useConsentTextsQuery, usePublishConsentTextMutation } from './api';
import {
  publishConsentTextRequestSchema,
  type ConsentText,
  type PublishConsentTextRequest,
} from '@/shared/protocol/practice';

function Paragraphs({ body, testID }: { body: string; testID: string }) {
  const paragraphs = body
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean);
  return (
    <View style={styles.paragraphs} testID={testID}>
      {paragraphs.map((p, i) => (
        <AppText key={i} variant="small" color={colors.text}>
          {p}
        </AppText>
      ))}
    </View>
  );
}

function PublishForm({ current, onDone }: { current: ConsentText | undefined; onDone: () => void }) {
  const publish = usePublishConsentTextMutation();
  const [pending, setPending] = useState<PublishConsentTextRequest | null>(null);
  const { control, handleSubmit } = useForm<PublishConsentTextRequest>({
    resolver: zodResolver(publishConsentTextRequestSchema),
    defaultValues: { title: current?.title ?? '', body: current?.body ?? '' },
  });
  // Publishing asks every client to sign again, so the form only checks the wording; the next step publishes.
  const review = handleSubmit((values) => setPending(values));
  const confirm = async () => {
    if (!pending) return;
    try {
      await publish.mutateAsync(pending);
      onDone();
    } catch {
      // The error is shown below the question; the wording stays in the form.
    }
  };
  return (
    <View style={styles.form} testID="consent-publish-form">
      <AppText variant="small" color={colors.textMuted}>
        Start from the current wording and change what the clinic needs. Leave an empty line between
        paragraphs.
      </AppText>
      <FormTextField control={control} name="title" label="Title" testID="consent-publish-title" />
      <FormTextField
        control={control}
        name="body"
        label="Wording the client reads and signs"
        multiline
        numberOfLines={12}
        textAlignVertical="top"
        testID="consent-publish-body"
      />
      {pending ? (
        <ConfirmStep
          question="Publish this wording?"
          confirmLabel="Yes, publish"
          cancelLabel="Keep editing"
          busy={publish.isPending}
          error={
            publish.isError ? `${publish.error.message} Nothing was published; the text above is kept.` : null
          }
          onConfirm={() => void confirm()}
          onCancel={() => {
            publish.reset();
            setPending(null);
          }}
          testID="consent-publish-confirm"
        >
          {`Every client signs it at their next visit, before anything is recorded${
            current ? `; the wording of version ${current.version} stops being offered` : ''
          }. Consent already given stays on record with the wording it was given for. A published wording cannot be taken back, only replaced by a newer one.`}
        </ConfirmStep>
      ) : (
        <View style={styles.row}>
          <Button
            label="Publish as the new version…"
            onPress={() => void review()}
            testID="consent-publish-submit"
          />
          <Button label="Cancel" variant="ghost" onPress={onDone} testID="consent-publish-cancel" />
        </View>
      )}
    </View>
  );
}

/** The clinic's consent wording: the version in force, earlier versions, and publishing a new one. */
export function ConsentTextsPanel() {
  const texts = useConsentTextsQuery();
  const [editing, setEditing] = useState(false);
  const [showEarlier, setShowEarlier] = useState(false);
  const current = texts.data?.find((t) => t.isCurrent);
  const earlier = (texts.data ?? []).filter((t) => !t.isCurrent).sort((a, b) => b.version - a.version);

  return (
    <Panel
      title="Consent wording"
      detail="What a client reads and signs before any recording. Each session keeps the version its client signed. Publishing a new version asks every client to sign it at their next visit; consent already given stays on record."
      testID="settings-consent"
    >
      <QueryView query={texts} loading="Loading the consent wording…" testID="consent-texts">
        {() => (
          <>
            {current ? (
              <View style={styles.card} testID="consent-current">
                <View style={styles.row}>
                  <Badge label={`In force · version ${current.version}`} tone="good" />
                  <AppText variant="small" color={colors.textMuted}>
                    published {formatDate(current.publishedAt)}
                  </AppText>
                </View>
                <AppText variant="bodyStrong" color={colors.ink}>
                  {current.title}
                </AppText>
                <Paragraphs body={current.body} testID="consent-current-body" />
              </View>
            ) : (
              <AppText variant="small" color={colors.caution} testID="consent-none">
                No consent wording is published yet; devices show the built-in text until one is.
              </AppText>
            )}
            {editing ? (
              <PublishForm current={current} onDone={() => setEditing(false)} />
            ) : (
              <View style={styles.row}>
                <Button
                  label="Write a new version…"
                  variant="secondary"
                  onPress={() => setEditing(true)}
                  testID="consent-publish-open"
                />
              </View>
            )}
            {earlier.length > 0 ? (
              <View style={styles.earlier}>
                <Button
                  label={showEarlier ? 'Hide earlier versions' : `Earlier versions (${earlier.length})`}
                  variant="ghost"
                  onPress={() => setShowEarlier((v) => !v)}
                  testID="consent-earlier-toggle"
                />
                {showEarlier
                  ? earlier.map((t) => (
                      <View key={t.id} style={styles.card} testID={`consent-version-${t.version}`}>
                        <AppText variant="smallStrong" color={colors.ink}>
                          Version {t.version} · {t.title} · published {formatDate(t.publishedAt)}
                        </AppText>
                        <Paragraphs body={t.body} testID={`consent-version-${t.version}-body`} />
                      </View>
                    ))
                  : null}
              </View>
            ) : null}
          </>
        )}
      </QueryView>
    </Panel>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  card: {
    gap: space.sm,
    padding: space.md,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surfaceMuted,
  },
  paragraphs: { gap: space.sm, maxWidth: 720 },
  form: { gap: space.md, maxWidth: 720 },
  earlier: { gap: space.sm },
});
