import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { ChoiceChips } from '@/ui/choice-chips';
import { colors, space } from '@/ui/theme';
import type { AudioInput } from '@/device/recorder/inputs';

type Props = {
  inputs: AudioInput[];
  chosen: string | null;
  chosenMissing: boolean;
  onChoose: (deviceId: string | null) => void;
};

const defaultChoice = 'default';

/** Which input to record from, shown once the device offers more than one (a sensor or stethoscope plugged in). */
export function InputPicker({ inputs, chosen, chosenMissing, onChoose }: Props) {
  if (inputs.length < 2 && !chosenMissing) return null;
  const choices = [
    { value: defaultChoice, label: 'Device default' },
    ...inputs.map((i) => ({
      value: i.deviceId,
      label: i.label.length > 32 ? `${i.label.slice(0, 31)}…` : i.label,
    })),
  ];
  return (
    <View style={styles.root} testID="input-picker">
      <AppText variant="caption" color={colors.textMuted}>
        INPUT
      </AppText>
      <ChoiceChips
        label="Record from"
        testID="input"
        value={chosen && !chosenMissing ? chosen : defaultChoice}
        onChange={(value) => onChoose(value === defaultChoice ? null : value)}
        choices={choices}
      />
      {chosenMissing ? (
        <AppText variant="small" color={colors.caution} testID="input-missing">
          The input chosen last time is not connected; plug it in, or record from another input.
        </AppText>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.xs },
});
