import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { cautionParagraphs } from '@/shared/cautions';
import { AppText } from './app-text';
import { CautionIcon } from './icons';
import { colors, space } from './theme';

/**
 * The caution in one line, for screens without results: "Wellness follow-up only · details". The full caution
 * (CautionNote) stays where results appear, so it is read there instead of skipped everywhere.
 */
export function CautionLine({ testID = 'caution-line' }: { testID?: string }) {
  const [open, setOpen] = useState(false);
  return (
    <View style={styles.box} testID={testID}>
      <View style={styles.line}>
        <CautionIcon color={colors.caution} size={14} />
        <AppText variant="small" color={colors.caution}>
          Wellness follow-up only ·{' '}
        </AppText>
        <Pressable
          onPress={() => setOpen((o) => !o)}
          accessibilityRole="button"
          accessibilityState={{ expanded: open }}
          accessibilityLabel={open ? 'Hide the cautions' : 'Show the cautions'}
          hitSlop={8}
          testID={`${testID}-toggle`}
        >
          <AppText variant="smallStrong" color={colors.accent} style={styles.link}>
            {open ? 'hide' : 'details'}
          </AppText>
        </Pressable>
      </View>
      {open
        ? cautionParagraphs.map((p) => (
            <AppText key={p} variant="small" color={colors.text}>
              {p}
            </AppText>
          ))
        : null}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.xs },
  line: { flexDirection: 'row', alignItems: 'center', gap: space.xs, flexWrap: 'wrap' },
  link: { textDecorationLine: 'underline' },
});
