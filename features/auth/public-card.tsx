import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radii, space } from '@/ui/theme';

/** The one card of the pages a person opens without being signed in (invitation, password reset). */
export function PublicCard({ testID, children }: { testID: string; children: ReactNode }) {
  return (
    <View style={styles.page} testID={testID}>
      <View style={styles.card}>{children}</View>
    </View>
  );
}

const styles = StyleSheet.create({
  page: {
    flex: 1,
    backgroundColor: colors.paper,
    alignItems: 'center',
    justifyContent: 'center',
    padding: space.lg,
  },
  card: {
    width: '100%',
    maxWidth: 440,
    backgroundColor: colors.surface,
    borderRadius: radii.lg,
    padding: space.xl,
    gap: space.md,
  },
});
