import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Button } from '@/ui/button';
import { FormDateField } from '@/ui/form-date-field';
import { FormTextField } from '@/ui/form-text-field';
import { displayTimeZone, formatDate, formatTime } from '@/ui/format';
import { addDays, todayIn } from '@/shared/format/dates';
import { calendarDateSchema } from '@/shared/protocol/dates';
import { colors, radii, space } from '@/ui/theme';
import { StaleNotesError, useSaveNotesMutation } from './api';
import type { ReviewNotes, StaleNotesDetails } from '@/shared/protocol/review';

/**
 * The form's rules. A new follow-up day is after today in the clinic's zone (the server checks the same); a day
 * saved earlier may stay as it is when other fields change.
 */
const formSchemaFrom = (firstFollowUpDay: string, savedFollowUp: string | null) =>
  z.object({
    findings: z.string().max(20000, { error: 'At most 20 000 characters.' }),
    plan: z.string().max(20000, { error: 'At most 20 000 characters.' }),
    followUpDate: z
      .string()
      .trim()
      .refine((v) => v === '' || calendarDateSchema.safeParse(v).success, {
        error: 'Choose a day on the calendar or type it as YYYY-MM-DD, or leave it empty.',
      })
      .refine(
        (v) =>
          v === '' ||
          v === savedFollowUp ||
          !calendarDateSchema.safeParse(v).success ||
          v >= firstFollowUpDay,
        {
          error: `A follow-up is after today: choose ${formatDate(firstFollowUpDay)} or later.`,
        },
      ),
  });
type FormValues = z.infer<ReturnType<typeof formSchemaFrom>>;

const toForm = (n: ReviewNotes): FormValues => ({
  findings: n.findings ?? '',
  plan: n.plan ?? '',
  followUpDate: n.followUpDate ?? '',
});

export function NotesForm({
  sessionId,
  notes,
  canEdit,
}: {
  sessionId: string;
  notes: ReviewNotes;
  canEdit: boolean;
}) {
  const save = useSaveNotesMutation(sessionId);
  const [baseVersion, setBaseVersion] = useState(notes.version);
  const [stale, setStale] = useState<StaleNotesDetails | null>(null);
  const [savedAt, setSavedAt] = useState<string | null>(null);
  const firstFollowUpDay = addDays(todayIn(displayTimeZone()), 1);
  const form = useForm<FormValues>({
    resolver: zodResolver(formSchemaFrom(firstFollowUpDay, notes.followUpDate)),
    defaultValues: toForm(notes),
  });
  useEffect(() => {
    if (!form.formState.isDirty && !stale) {
      form.reset(toForm(notes));
      setBaseVersion(notes.version);
    }
  }, [notes, form, stale]);

  const submit = form.handleSubmit(async (values) => {
    setSavedAt(null);
    try {
      const saved = await save.mutateAsync({
        findings: values.findings || null,
        plan: values.plan || null,
        followUpDate: values.followUpDate || null,
        baseVersion,
      });
      setStale(null);
      setBaseVersion(saved.version);
      form.reset(toForm(saved));
      setSavedAt(formatTime(new Date().toISOString()));
    } catch (error) {
      if (error instanceof StaleNotesError) setStale(error.details);
    }
  });

  return (
    <Card testID="notes-form">
      <AppText variant="heading" color={colors.ink}>
        Findings and plan
      </AppText>
      {!canEdit ? (
        <AppText variant="small" color={colors.textMuted}>
          Only a practitioner can write findings.
        </AppText>
      ) : null}
      <FormTextField
        control={form.control}
        name="findings"
        label="Findings"
        testID="notes-findings"
        multiline
        numberOfLines={4}
        editable={canEdit}
      />
      <FormTextField
        control={form.control}
        name="plan"
        label="Plan"
        testID="notes-plan"
        multiline
        numberOfLines={3}
        editable={canEdit}
      />
      <FormDateField
        control={form.control}
        name="followUpDate"
        label="Follow-up date"
        testID="notes-follow-up"
        min={firstFollowUpDay}
        editable={canEdit}
      />
      {stale ? (
        <View style={styles.stale} testID="notes-stale" accessibilityRole="alert">
          <AppText variant="bodyStrong" color={colors.danger}>
            {stale.current.reviewedBy
              ? `${stale.current.reviewedBy} saved this session while you were writing.`
              : 'Someone else saved this session while you were writing.'}{' '}
            Nothing was overwritten.
          </AppText>
          <AppText variant="smallStrong" color={colors.ink}>
            Their findings: <AppText variant="small">{stale.current.findings ?? '—'}</AppText>
          </AppText>
          <AppText variant="smallStrong" color={colors.ink}>
            Their plan: <AppText variant="small">{stale.current.plan ?? '—'}</AppText> · follow-up{' '}
            {stale.current.followUpDate ?? '—'}
          </AppText>
          <View style={styles.row}>
            <Button
              label="Keep mine and save over theirs"
              testID="notes-keep-mine"
              onPress={() => {
                setBaseVersion(stale.current.version);
                setStale(null);
              }}
              variant="secondary"
            />
            <Button
              label="Take theirs"
              testID="notes-take-theirs"
              variant="ghost"
              onPress={() => {
                form.reset(toForm(stale.current));
                setBaseVersion(stale.current.version);
                setStale(null);
              }}
            />
          </View>
        </View>
      ) : null}
      {save.isError && !(save.error instanceof StaleNotesError) ? (
        <AppText variant="small" color={colors.danger} testID="notes-error">
          {save.error.message} Your text is still here; try again.
        </AppText>
      ) : null}
      <View style={styles.row}>
        <Button
          label="Save findings"
          testID="notes-save"
          onPress={() => void submit()}
          busy={save.isPending}
          disabled={!canEdit || Boolean(stale)}
        />
        {savedAt ? (
          <AppText variant="small" color={colors.pulse} testID="notes-saved">
            Saved at {savedAt}
          </AppText>
        ) : notes.reviewedAt ? (
          <AppText variant="small" color={colors.textMuted}>
            Last saved by {notes.reviewedBy ?? '—'}
          </AppText>
        ) : null}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  stale: { backgroundColor: colors.dangerSoft, borderRadius: radii.md, padding: space.md, gap: space.sm },
  row: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
});
