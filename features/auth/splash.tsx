import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { BrandMark } from '@/ui/icons';
import { colors, space } from '@/ui/theme';

export function Splash() {
  return (
    <View style={styles.root} testID="splash">
      <BrandMark size={48} color={colors.ink} accent={colors.accent} />
      <ActivityIndicator color={colors.ink} />
    </View>
  );
}

const styles = StyleSheet.create({
  root: {
    flex: 1,
    alignItems: 'center',
    justifyContent: 'center',
    gap: space.lg,
    backgroundColor: colors.paper,
  },
});
