import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { colors, radii, space } from '@/ui/theme';

// Peak thresholds for the hint under the bar (common practice, no source): near full scale the clip will be
// flattened; below a few percent the chest piece is probably not on the skin.
export const clipLevel = 0.97;
export const quietLevel = 0.02;

export type LevelHint = 'too-loud' | 'too-quiet' | 'ok';

export function levelHint(level: number): LevelHint {
  if (level >= clipLevel) return 'too-loud';
  if (level < quietLevel) return 'too-quiet';
  return 'ok';
}

const hintText: Record<LevelHint, string> = {
  'too-loud': 'Too loud: the signal is clipping. Press more lightly or lower the input.',
  'too-quiet': 'Very quiet: check the chest piece is on the skin.',
  ok: 'Input level fine.',
};

/** Live input level: 0..1 of full scale, drawn on a square-root scale so quiet heart sounds still move the bar. */
export function LevelMeter({ level }: { level: number }) {
  const clamped = Math.max(0, Math.min(1, Number.isFinite(level) ? level : 0));
  const shown = Math.sqrt(clamped);
  const hint = levelHint(clamped);
  const fill = hint === 'too-loud' ? colors.danger : hint === 'too-quiet' ? colors.caution : colors.pulse;
  return (
    <View
      style={styles.root}
      testID="level-meter"
      accessibilityRole="progressbar"
      accessibilityValue={{ min: 0, max: 100, now: Math.round(clamped * 100) }}
    >
      <View style={styles.track}>
        <View
          testID="level-meter-fill"
          style={[
            styles.fill,
            { width: `${(shown * 100).toFixed(1)}%` as `${number}%`, backgroundColor: fill },
          ]}
        />
      </View>
      <AppText
        variant="caption"
        color={hint === 'ok' ? colors.textMuted : fill}
        testID={`level-hint-${hint}`}
      >
        {hintText[hint]}
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.xs },
  track: {
    height: 14,
    borderRadius: radii.pill,
    backgroundColor: colors.surfaceMuted,
    overflow: 'hidden',
    borderWidth: 1,
    borderColor: colors.line,
  },
  fill: { height: '100%', borderRadius: radii.pill },
});
