import { StyleSheet, View } from 'react-native';
import { cautionParagraphs } from '@/shared/cautions';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';
import { CautionIcon } from './icons';

type Props = { compact?: boolean; testID?: string };

/** The product's cautions, shown on every screen that shows results. */
export function CautionNote({ compact = false, testID = 'caution-note' }: Props) {
  return (
    <View style={[styles.box, compact && styles.compact]} testID={testID} accessibilityRole="summary">
      <View style={styles.head}>
        <CautionIcon color={colors.caution} size={compact ? 16 : 18} />
        <AppText variant="smallStrong" color={colors.caution}>
          Wellness follow-up only
        </AppText>
      </View>
      {cautionParagraphs.map((p) => (
        <AppText key={p} variant={compact ? 'caption' : 'small'} color={colors.text} style={styles.paragraph}>
          {p}
        </AppText>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  box: {
    backgroundColor: colors.cautionSoft,
    borderColor: colors.cautionLine,
    borderWidth: 1,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.xs,
  },
  compact: { padding: space.md },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm, marginBottom: space.xs },
  paragraph: { letterSpacing: 0 },
});
