import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { TextField } from '@/ui/text-field';
import { formatDate } from '@/ui/format';
import { referToClinician } from '@/shared/cautions';
import { colors, radii, space } from '@/ui/theme';
import { useReferralFlagMutation } from './api';
import type { SessionReferral } from '@/shared/protocol/review';

/**
 * The session's referral in words, with every reason; the practitioner adds their own flag with a note, or clears
 * it with a note. The analysis's own reasons stay while the analysis says so.
 */
export function ReferralPanel({
  sessionId,
  referral,
  canEdit,
}: {
  sessionId: string;
  referral: SessionReferral;
  canEdit: boolean;
}) {
  const mutation = useReferralFlagMutation(sessionId);
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = (flagged: boolean) => {
    if (!note.trim()) {
      setError(
        flagged
          ? 'Write a short note saying why you flag it.'
          : 'Write a short note saying why you clear it.',
      );
      return;
    }
    setError(null);
    mutation.mutate(
      { flagged, note: note.trim() },
      { onSuccess: () => setNote(''), onError: (e) => setError(e.message) },
    );
  };
  return (
    <View
      style={[styles.box, referral.flagged ? styles.flagged : styles.clear]}
      testID="referral-panel"
      accessibilityRole={referral.flagged ? 'alert' : undefined}
    >
      <AppText
        variant="bodyStrong"
        color={referral.flagged ? colors.danger : colors.ink}
        testID="referral-state"
      >
        {referral.flagged
          ? `⚠ Flagged for referral: ${referToClinician}`
          : 'Not flagged for referral: nothing measured calls for one'}
      </AppText>
      {referral.reasons.length ? (
        <View testID="referral-reasons">
          {referral.reasons.map((reason) => (
            <AppText key={reason} variant="small" color={colors.text}>
              • {reason}
            </AppText>
          ))}
        </View>
      ) : null}
      {referral.manual ? (
        <AppText variant="caption" color={colors.textMuted}>
          Flag set by hand on {formatDate(referral.manual.flaggedAt)}.
        </AppText>
      ) : null}
      {canEdit ? (
        <View style={styles.form}>
          <TextField
            label={referral.manual ? 'Note on clearing your flag' : 'Note on flagging for referral'}
            testID="referral-note"
            value={note}
            onChangeText={setNote}
            error={error ?? undefined}
            maxLength={2000}
          />
          <View style={styles.actions}>
            {referral.manual ? (
              <Button
                label="Clear my flag"
                variant="secondary"
                testID="referral-clear"
                busy={mutation.isPending}
                onPress={() => submit(false)}
              />
            ) : (
              <Button
                label="Flag for referral"
                variant="secondary"
                testID="referral-flag"
                busy={mutation.isPending}
                onPress={() => submit(true)}
              />
            )}
          </View>
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderRadius: radii.md, padding: space.md, gap: space.xs, borderWidth: 1 },
  flagged: { backgroundColor: colors.dangerSoft, borderColor: colors.danger },
  clear: { backgroundColor: colors.surface, borderColor: colors.line },
  form: { gap: space.xs, marginTop: space.xs },
  actions: { flexDirection: 'row', gap: space.sm },
});
