import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { usePointerWords } from '@/ui/use-pointer-words';
import { colors, radii, space } from '@/ui/theme';
import { fieldLabel, valueText } from './conflict-words';

export type Side = 'server' | 'client';
export type DifferingField = { field: string; server: unknown; client: unknown };

type Props = {
  fields: readonly DifferingField[];
  picks: Partial<Record<string, Side>>;
  onPick: (field: string, side: Side) => void;
  wide: boolean;
  disabled?: boolean;
};

// The glossary's words: the clinic's record (what the server holds) and the change (what a phone sent offline).
const sideWords: Record<Side, string> = { server: 'the record', client: 'the change' };

// The words carry the choice; the colour only repeats it.
function Option({
  field,
  side,
  value,
  chosen,
  onPress,
  disabled,
}: {
  field: string;
  side: Side;
  value: unknown;
  chosen: boolean;
  onPress: () => void;
  disabled: boolean;
}) {
  const pointer = usePointerWords();
  return (
    <Pressable
      testID={`pick-${field}-${side}`}
      accessibilityRole="radio"
      accessibilityState={{ checked: chosen, disabled }}
      accessibilityLabel={`${fieldLabel(field)}: keep ${sideWords[side]}, ${valueText(field, value)}`}
      disabled={disabled}
      onPress={onPress}
      style={({ pressed }) => [
        styles.option,
        chosen && styles.optionChosen,
        pressed && !chosen && styles.optionPressed,
      ]}
    >
      <AppText variant="caption" color={chosen ? colors.pulse : colors.textMuted}>
        {chosen
          ? `✓ KEEPING ${sideWords[side].toUpperCase()}`
          : `${sideWords[side].toUpperCase()} · ${pointer.Verb.toUpperCase()} TO KEEP`}
      </AppText>
      <AppText variant="small" color={colors.text} testID={`pick-${field}-${side}-value`}>
        {valueText(field, value)}
      </AppText>
    </Pressable>
  );
}

/** One row per differing field; the admin chooses which side's value the row keeps. */
export function FieldPicker({ fields, picks, onPick, wide, disabled = false }: Props) {
  return (
    <View style={styles.list} testID="field-picker" accessibilityRole="list">
      {fields.map(({ field, server, client }) => {
        const pick = picks[field];
        return (
          <View key={field} style={[styles.row, wide && styles.rowWide]} testID={`pick-${field}`}>
            <View style={wide ? styles.labelWide : undefined}>
              <AppText variant="smallStrong" color={colors.ink}>
                {fieldLabel(field)}
              </AppText>
              <AppText
                variant="caption"
                color={pick ? colors.textMuted : colors.caution}
                testID={`pick-${field}-state`}
              >
                {pick ? `Keeping ${sideWords[pick]}` : 'Not chosen yet'}
              </AppText>
            </View>
            <View style={[styles.options, wide && styles.optionsWide]} accessibilityRole="radiogroup">
              <Option
                field={field}
                side="server"
                value={server}
                chosen={pick === 'server'}
                onPress={() => onPick(field, 'server')}
                disabled={disabled}
              />
              <Option
                field={field}
                side="client"
                value={client}
                chosen={pick === 'client'}
                onPress={() => onPick(field, 'client')}
                disabled={disabled}
              />
            </View>
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
  row: { gap: space.sm, paddingBottom: space.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  rowWide: { flexDirection: 'row', alignItems: 'flex-start' },
  labelWide: { width: 180, paddingTop: space.sm },
  options: { gap: space.sm },
  optionsWide: { flex: 1, flexDirection: 'row' },
  option: {
    flex: 1,
    gap: 2,
    padding: space.md,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  optionChosen: { borderColor: colors.pulse, borderWidth: 2, backgroundColor: colors.pulseSoft },
  optionPressed: { backgroundColor: colors.surfaceMuted },
});
