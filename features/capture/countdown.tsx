import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { colors, space } from '@/ui/theme';

export function Countdown({ remainingS, totalS }: { remainingS: number; totalS: number }) {
  const left = Math.max(0, Math.ceil(remainingS));
  return (
    <View style={styles.root} testID="countdown" accessibilityLiveRegion="polite">
      <AppText variant="numberLarge" color={colors.ink} testID="countdown-seconds">
        {left} s
      </AppText>
      <AppText variant="caption" color={colors.textMuted}>
        left of {totalS} s · keep still, breathe as instructed
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({ root: { alignItems: 'center', gap: space.xs } });
