import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { Card } from '@/ui/card';
import { colors, space } from '@/ui/theme';

/** The one card of the pages a person opens without being signed in (invitation, password reset). */
export function PublicCard({ testID, children }: { testID: string; children: ReactNode }) {
  return (
    <View style={styles.page} testID={testID}>
      <Card roomy style={styles.card}>
        {children}
      </Card>
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
  card: { width: '100%', maxWidth: 440 },
});
