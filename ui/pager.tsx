import { StyleSheet, View } from 'react-native';
import { colors, space } from './theme';
import { AppText } from './app-text';
import { Button } from './button';

/** "21–40 of 57" with previous and next. */
export function Pager({
  page,
  pageSize,
  total,
  onPage,
  testID,
}: {
  page: number;
  pageSize: number;
  total: number;
  onPage: (page: number) => void;
  testID: string;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <View style={styles.row} testID={testID}>
      <AppText variant="small" color={colors.textMuted} testID={`${testID}-range`}>
        {total === 0 ? 'None' : `${first}–${last} of ${total}`}
      </AppText>
      <View style={styles.buttons}>
        <Button
          label="Previous"
          variant="secondary"
          disabled={page <= 1}
          onPress={() => onPage(page - 1)}
          testID={`${testID}-prev`}
        />
        <AppText variant="small" color={colors.text}>
          Page {page} of {pages}
        </AppText>
        <Button
          label="Next"
          variant="secondary"
          disabled={page >= pages}
          onPress={() => onPage(page + 1)}
          testID={`${testID}-next`}
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    justifyContent: 'space-between',
    flexWrap: 'wrap',
    gap: space.md,
  },
  buttons: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
