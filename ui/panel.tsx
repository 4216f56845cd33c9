import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors } from './theme';
import { AppText } from './app-text';
import { Card } from './card';

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
    <Card tone={tone} testID={testID}>
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
    </Card>
  );
}

const styles = StyleSheet.create({
  head: { gap: 2 },
});
