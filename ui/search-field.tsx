import { StyleSheet, TextInput, View } from 'react-native';
import { colors, fonts, radii, space } from './theme';
import { SearchIcon } from './icons';

export function SearchField({
  value,
  onChangeText,
  placeholder,
  label,
  testID,
}: {
  value: string;
  onChangeText: (text: string) => void;
  placeholder: string;
  label: string;
  testID: string;
}) {
  return (
    <View style={styles.search}>
      <SearchIcon color={colors.textMuted} />
      <TextInput
        testID={testID}
        accessibilityLabel={label}
        placeholder={placeholder}
        placeholderTextColor={colors.textMuted}
        value={value}
        onChangeText={onChangeText}
        autoCapitalize="none"
        autoCorrect={false}
        style={styles.input}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  search: {
    flex: 1,
    minWidth: 0,
    maxWidth: 520,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    paddingHorizontal: space.md,
  },
  input: {
    flex: 1,
    minWidth: 0,
    width: '100%',
    minHeight: 44,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.text,
  },
});
