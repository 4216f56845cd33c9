import { StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';

export type BadgeTone = 'good' | 'caution' | 'neutral' | 'danger' | 'ink';

const tones: Record<BadgeTone, { bg: string; fg: string }> = {
  good: { bg: colors.pulseSoft, fg: colors.pulse },
  caution: { bg: colors.cautionSoft, fg: colors.caution },
  neutral: { bg: colors.surfaceMuted, fg: colors.textMuted },
  danger: { bg: colors.dangerSoft, fg: colors.danger },
  ink: { bg: colors.ink, fg: colors.textOnInk },
};

export function Badge({
  label,
  tone = 'neutral',
  testID,
}: {
  label: string;
  tone?: BadgeTone;
  testID?: string;
}) {
  const t = tones[tone];
  return (
    <View style={[styles.badge, { backgroundColor: t.bg }]} testID={testID}>
      <AppText variant="caption" color={t.fg}>
        {label}
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  badge: {
    alignSelf: 'flex-start',
    paddingHorizontal: space.sm,
    paddingVertical: 2,
    borderRadius: radii.pill,
  },
});
