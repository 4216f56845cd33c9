import type { ReactNode } from 'react';
import { StyleSheet, View, type StyleProp, type ViewStyle } from 'react-native';
import { colors, radii, space } from './theme';

/**
 * The white card every grouped part of a screen sits on. `roomy` is the larger card of a page with one card
 * (sign-in, invitation, password reset); `compact` the smaller card of a list of them (a site, a visit's murmur
 * screen); `tone="danger"` outlines a card whose actions cannot be undone.
 */
export function Card({
  children,
  testID,
  roomy = false,
  compact = false,
  tone = 'plain',
  style,
}: {
  children: ReactNode;
  testID?: string;
  roomy?: boolean;
  compact?: boolean;
  tone?: 'plain' | 'danger';
  style?: StyleProp<ViewStyle>;
}) {
  return (
    <View
      style={[
        styles.card,
        roomy && styles.roomy,
        compact && styles.compact,
        tone === 'danger' && styles.danger,
        style,
      ]}
      testID={testID}
    >
      {children}
    </View>
  );
}

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    padding: space.lg,
    gap: space.md,
  },
  compact: { padding: space.md, gap: space.sm },
  roomy: { borderRadius: radii.lg, borderWidth: 0, padding: space.xl },
  danger: { borderColor: colors.danger },
});
