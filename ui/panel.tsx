import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';

/** A titled white card that groups one part of a screen. */
export function Panel({
  title,
  detail,
  children,
  testID,
  tone = 'plain',
}: {
  title: string;
  detail?: string;
  children: ReactNode;
  testID?: string;
  tone?: 'plain' | 'danger';
}) {
  return (
    <View style={[styles.panel, tone === 'danger' && styles.danger]} testID={testID}>
      <View style={styles.head}>
        <AppText variant="heading" color={tone === 'danger' ? colors.danger : colors.ink}>
          {title}
        </AppText>
        {detail ? (
          <AppText variant="small" color={colors.textMuted}>
            {detail}
          </AppText>
        ) : null}
      </View>
      {children}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: {
    backgroundColor: colors.surface,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.md,
    borderWidth: 1,
    borderColor: colors.line,
  },
  danger: { borderColor: colors.danger },
  head: { gap: 2 },
});
