import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Button } from '@/ui/button';
import { TextField } from '@/ui/text-field';
import { colors, radii, space } from '@/ui/theme';
import { resolveConflictRequestSchema, type ResolveConflictRequest } from '@/shared/protocol/sync';
import { fieldLabel } from './conflict-words';
import { FieldPicker, type DifferingField, type Side } from './field-picker';

type Keep = ResolveConflictRequest['keep'];

const keepChoices: readonly { keep: Keep; title: string; detail: string }[] = [
  {
    keep: 'server',
    title: 'Keep the clinic’s record',
    detail: 'The change made offline is dropped; every phone gets the clinic’s record.',
  },
  {
    keep: 'client',
    title: 'Keep the change',
    detail: 'The change replaces the clinic’s record in every field that differs.',
  },
  { keep: 'fields', title: 'Pick field by field', detail: 'Choose a side for each differing field.' },
];

type Props = {
  differing: readonly DifferingField[];
  onSubmit: (request: ResolveConflictRequest) => void;
  wide: boolean;
  busy?: boolean;
  /** A refusal from the server, shown under the button. */
  serverError?: string | null;
};

/** The admin's decision; nothing is sent until the choice is complete and a note says why. */
export function ResolveForm({ differing, onSubmit, wide, busy = false, serverError }: Props) {
  const [keep, setKeep] = useState<Keep | null>(null);
  const [picks, setPicks] = useState<Partial<Record<string, Side>>>({});
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<{ keep?: string; fields?: string; note?: string }>({});

  const submit = () => {
    const next: typeof errors = {};
    if (!keep)
      next.keep = 'Choose how to settle it: keep the record, keep the change, or pick field by field.';
    if (keep === 'fields') {
      const missing = differing.filter((d) => !picks[d.field]).map((d) => fieldLabel(d.field));
      if (missing.length) next.fields = `Pick a side for: ${missing.join(', ')}.`;
    }
    const fields =
      keep === 'fields'
        ? Object.fromEntries(differing.map((d) => [d.field, picks[d.field] as Side]))
        : undefined;
    const parsed = resolveConflictRequestSchema.safeParse({ keep: keep ?? 'server', fields, note });
    if (!parsed.success) {
      const noteIssue = parsed.error.issues.find((i) => i.path[0] === 'note');
      if (noteIssue) next.note = noteIssue.message;
    }
    setErrors(next);
    if (Object.keys(next).length || !parsed.success) return;
    onSubmit(parsed.data);
  };

  return (
    <Card testID="resolve-form">
      <AppText variant="heading" color={colors.ink}>
        Resolve
      </AppText>
      <View style={[styles.choices, wide && styles.choicesWide]} accessibilityRole="radiogroup">
        {keepChoices.map((c) => {
          const chosen = keep === c.keep;
          return (
            <Pressable
              key={c.keep}
              testID={`resolve-keep-${c.keep}`}
              accessibilityRole="radio"
              accessibilityState={{ checked: chosen }}
              accessibilityLabel={c.title}
              onPress={() => {
                setKeep(c.keep);
                setErrors((e) => ({ ...e, keep: undefined, fields: undefined }));
              }}
              style={[styles.choice, chosen && styles.choiceChosen]}
            >
              <AppText variant="smallStrong" color={colors.ink}>
                {chosen ? `● ${c.title}` : `○ ${c.title}`}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                {c.detail}
              </AppText>
            </Pressable>
          );
        })}
      </View>
      {errors.keep ? (
        <AppText variant="small" color={colors.danger} testID="resolve-keep-error" accessibilityRole="alert">
          {errors.keep}
        </AppText>
      ) : null}
      {keep === 'fields' ? (
        <>
          <FieldPicker
            fields={differing}
            picks={picks}
            wide={wide}
            disabled={busy}
            onPick={(field, side) => {
              setPicks((p) => ({ ...p, [field]: side }));
              setErrors((e) => ({ ...e, fields: undefined }));
            }}
          />
          {errors.fields ? (
            <AppText
              variant="small"
              color={colors.danger}
              testID="resolve-fields-error"
              accessibilityRole="alert"
            >
              {errors.fields}
            </AppText>
          ) : null}
        </>
      ) : null}
      <TextField
        label="Note (required): why this choice"
        testID="resolve-note"
        multiline
        numberOfLines={3}
        value={note}
        onChangeText={(text) => {
          setNote(text);
          setErrors((e) => ({ ...e, note: undefined }));
        }}
        error={errors.note}
      />
      <View style={styles.actions}>
        <Button
          label={busy ? 'Resolving…' : 'Resolve conflict'}
          onPress={submit}
          busy={busy}
          testID="resolve-submit"
        />
      </View>
      {serverError ? (
        <AppText variant="small" color={colors.danger} testID="resolve-error" accessibilityRole="alert">
          {serverError}
        </AppText>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  choices: { gap: space.sm },
  choicesWide: { flexDirection: 'row' },
  choice: {
    flex: 1,
    gap: 2,
    padding: space.md,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
  },
  choiceChosen: { borderColor: colors.ink, borderWidth: 2, backgroundColor: colors.surfaceMuted },
  actions: { flexDirection: 'row' },
});
