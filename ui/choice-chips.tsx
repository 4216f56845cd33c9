import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radii, space } from './theme';
import { AppText } from './app-text';

export type Choice<V extends string> = { value: V; label: string };

/** One choice out of a few, as a row of chips; `showLabel` writes the label above them (else it is only read out). */
export function ChoiceChips<V extends string>({
  choices,
  value,
  onChange,
  testID,
  label,
  showLabel = false,
}: {
  choices: readonly Choice<V>[];
  value: V;
  onChange: (value: V) => void;
  testID: string;
  label: string;
  showLabel?: boolean;
}) {
  const chips = (
    <View style={styles.row} testID={testID} accessibilityRole="radiogroup" accessibilityLabel={label}>
      {choices.map((c) => {
        const on = c.value === value;
        return (
          <Pressable
            key={c.value}
            onPress={() => onChange(c.value)}
            style={[styles.chip, on && styles.chipOn]}
            testID={`${testID}-${c.value}`}
            accessibilityRole="radio"
            accessibilityState={{ checked: on }}
            // react-native-web reads the ARIA prop, not accessibilityState: a radio's state is aria-checked.
            aria-checked={on}
          >
            <AppText variant="small" color={on ? colors.textOnInk : colors.ink}>
              {c.label}
            </AppText>
          </Pressable>
        );
      })}
    </View>
  );
  if (!showLabel) return chips;
  return (
    <View style={styles.labelled}>
      <AppText variant="smallStrong" color={colors.ink}>
        {label}
      </AppText>
      {chips}
    </View>
  );
}

const styles = StyleSheet.create({
  labelled: { gap: space.xs },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  chip: {
    paddingHorizontal: space.md,
    paddingVertical: space.xs + 2,
    borderRadius: radii.pill,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
});
