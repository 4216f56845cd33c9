import type { ReactNode } from 'react';
import { ActivityIndicator, Pressable, StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';

/** `danger` is for actions that cannot be undone (erase, discard), always behind a confirmation. */
type Variant = 'primary' | 'secondary' | 'ghost' | 'on-ink' | 'danger';

type Props = {
  label: string;
  onPress: () => void;
  testID: string;
  variant?: Variant;
  disabled?: boolean;
  busy?: boolean;
  icon?: (color: string) => ReactNode;
};

const palette: Record<Variant, { bg: string; pressed: string; text: string; border: string }> = {
  primary: {
    bg: colors.accent,
    pressed: colors.accentPressed,
    text: colors.textOnAccent,
    border: colors.accent,
  },
  secondary: { bg: colors.surface, pressed: colors.surfaceMuted, text: colors.ink, border: colors.line },
  ghost: { bg: 'transparent', pressed: colors.surfaceMuted, text: colors.ink, border: 'transparent' },
  'on-ink': { bg: 'transparent', pressed: colors.inkSoft, text: colors.textOnInk, border: colors.inkSoft },
  danger: {
    bg: colors.danger,
    pressed: colors.dangerPressed,
    text: colors.textOnAccent,
    border: colors.danger,
  },
};

export function Button({
  label,
  onPress,
  testID,
  variant = 'primary',
  disabled = false,
  busy = false,
  icon,
}: Props) {
  const p = palette[variant];
  const inactive = disabled || busy;
  return (
    <Pressable
      testID={testID}
      accessibilityRole="button"
      accessibilityLabel={label}
      accessibilityState={{ disabled: inactive, busy }}
      disabled={inactive}
      onPress={onPress}
      style={({ pressed }) => [
        styles.base,
        { backgroundColor: pressed ? p.pressed : p.bg, borderColor: p.border, opacity: inactive ? 0.6 : 1 },
      ]}
    >
      <View style={styles.row}>
        {busy ? <ActivityIndicator size="small" color={p.text} /> : icon?.(p.text)}
        <AppText variant="smallStrong" color={p.text}>
          {label}
        </AppText>
      </View>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: {
    minHeight: 44,
    paddingHorizontal: space.lg,
    borderRadius: radii.md,
    borderWidth: 1,
    justifyContent: 'center',
  },
  row: { flexDirection: 'row', alignItems: 'center', justifyContent: 'center', gap: space.sm },
});
