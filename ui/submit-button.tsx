import type { ComponentProps } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from './app-text';
import { Button } from './button';
import { colors, space } from './theme';

/** What came of the last press: a failure to act on, or a line saying it is done. */
export type Outcome = { text: string; error: boolean } | null;

/** What a failed mutation says, for `outcome`. */
export const failureOf = (action: { error: Error | null }): Outcome =>
  action.error ? { text: action.error.message, error: true } : null;

type Props = ComponentProps<typeof Button> & {
  outcome: Outcome;
  /** Beside the button (a save row) rather than under it (a one-column form). */
  inline?: boolean;
};

/**
 * A form's send button with what came of it, in danger red or green (test ids `${testID}-error` and
 * `${testID}-ok`): one place for the words after a press.
 */
export function SubmitButton({ outcome, inline = false, ...button }: Props) {
  const said = outcome ? (
    <AppText
      variant={inline ? 'small' : 'body'}
      color={outcome.error ? colors.danger : colors.pulse}
      testID={`${button.testID}-${outcome.error ? 'error' : 'ok'}`}
    >
      {outcome.text}
    </AppText>
  ) : null;
  if (!inline) {
    return (
      <>
        <Button {...button} />
        {said}
      </>
    );
  }
  return (
    <View style={styles.row}>
      <Button {...button} />
      {said}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
});
