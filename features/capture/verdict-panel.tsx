import { useState } from 'react';
import { StyleSheet, TextInput, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { cautionParagraphs, referToClinician } from '@/shared/cautions';
import { verdictWords } from '@/ui/verdicts';
import { colors, fonts, radii, space } from '@/ui/theme';
import type { AnalysisResult } from '@/shared/analysis/types';

type Props = {
  analysis: AnalysisResult;
  busy: boolean;
  onKeep: (note: string | null) => void;
  onRetake: () => void;
};

/** The take's verdict and what to do next; a poor take must be retaken or kept with a note saying why. */
export function VerdictPanel({ analysis, busy, onKeep, onRetake }: Props) {
  const { verdict, reasons } = analysis.quality;
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string | null>(null);
  const words = verdictWords[verdict];
  const rate = analysis.heartRateBpm;
  const irregular = analysis.metrics?.irregularRhythm ?? false;

  const keepAnyway = () => {
    if (note.trim().length < 3) {
      setNoteError('Say why this take is kept (at least 3 characters), for the practitioner reviewing it.');
      return;
    }
    onKeep(note.trim());
  };

  return (
    <View style={styles.root} testID="verdict-panel">
      <View style={styles.row}>
        <Badge label={words.label} tone={words.tone} testID={`verdict-${verdict}`} />
        <AppText variant="numberLarge" color={colors.ink} testID="heart-rate">
          {rate === null ? '— bpm' : `${Math.round(rate)} bpm`}
        </AppText>
      </View>
      {reasons.length > 0 ? (
        <View style={styles.reasons} testID="verdict-reasons">
          {reasons.map((r) => (
            <AppText key={r.code} variant="small" color={colors.text} testID={`reason-${r.code}`}>
              • {r.message}
            </AppText>
          ))}
        </View>
      ) : null}
      {irregular || reasons.some((r) => r.code === 'rate_out_of_range') ? (
        <AppText variant="smallStrong" color={colors.caution} testID="refer-note">
          Rhythm or rate outside the usual pattern: {referToClinician}.
        </AppText>
      ) : null}
      {analysis.screen?.murmur === 'possible' ? (
        <View style={styles.reasons} testID="murmur-note">
          <AppText variant="smallStrong" color={colors.caution}>
            {`Possible murmur: ${referToClinician}.`}
          </AppText>
          {analysis.screen.reasons.map((reason) => (
            <AppText key={reason} variant="small" color={colors.caution}>
              • {reason}
            </AppText>
          ))}
          <AppText variant="caption" color={colors.caution}>
            {cautionParagraphs[0]}
          </AppText>
        </View>
      ) : null}
      {analysis.screen?.murmur === 'unsure' ? (
        <AppText variant="small" color={colors.text} testID="murmur-unsure">
          Murmur screen: this take is too poor to tell.
        </AppText>
      ) : null}
      {verdict === 'retake' ? (
        <>
          <Button label="Retake this site" onPress={onRetake} testID="retake" disabled={busy} />
          <TextInput
            testID="keep-note"
            accessibilityLabel="Note on why the take is kept"
            placeholder="Why keep it anyway? (e.g. client could not hold still)"
            placeholderTextColor={colors.textMuted}
            value={note}
            onChangeText={(t) => {
              setNote(t);
              setNoteError(null);
            }}
            style={styles.note}
            multiline
          />
          {noteError ? (
            <AppText variant="caption" color={colors.danger} testID="keep-note-error">
              {noteError}
            </AppText>
          ) : null}
          <Button
            label="Keep anyway, with this note"
            onPress={keepAnyway}
            testID="keep-anyway"
            variant="secondary"
            busy={busy}
          />
        </>
      ) : (
        <View style={styles.actions}>
          <Button label="Keep and continue" onPress={() => onKeep(null)} testID="keep-take" busy={busy} />
          <Button label="Retake" onPress={onRetake} testID="retake" variant="secondary" disabled={busy} />
        </View>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.md },
  row: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between' },
  reasons: { gap: space.xs },
  actions: { gap: space.sm },
  note: {
    minHeight: 64,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    backgroundColor: colors.surface,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.text,
  },
});
