import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Badge } from '@/ui/badge';
import { formatDate } from '@/ui/format';
import { colors, space } from '@/ui/theme';
import type { TrendMurmur } from '@/shared/protocol/review';
import { murmurWords } from './review-words';

/** The murmur screen of each visit at one site, oldest first, in the same words as the session view. */
export function MurmurByVisit({ screens }: { screens: TrendMurmur[] }) {
  if (screens.length === 0) return null;
  return (
    <Card compact style={styles.tight} testID="trends-murmur">
      <AppText variant="smallStrong" color={colors.ink}>
        Murmur screen at each visit
      </AppText>
      {screens.map((m) => {
        const words = murmurWords(m.screen);
        return (
          <View key={m.sessionId} style={styles.row} testID={`trends-murmur-${m.sessionId}`}>
            <AppText variant="number" color={colors.text} style={styles.date}>
              {formatDate(m.startedAt)}
            </AppText>
            <Badge label={words.label} tone={words.tone} />
          </View>
        );
      })}
    </Card>
  );
}

const styles = StyleSheet.create({
  tight: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  date: { minWidth: 96 },
});
