import { forwardRef, useState } from 'react';
import { StyleSheet, TextInput, View, type TextInputProps } from 'react-native';
import { colors, fonts, radii, space } from './theme';
import { AppText } from './app-text';

type Props = Omit<TextInputProps, 'style'> & {
  label: string;
  testID: string;
  error?: string;
};

export const TextField = forwardRef<TextInput, Props>(function TextField(
  { label, testID, error, onFocus, onBlur, ...rest },
  ref,
) {
  const [focused, setFocused] = useState(false);
  return (
    <View style={styles.wrap}>
      <AppText variant="smallStrong" color={colors.ink} nativeID={`${testID}-label`}>
        {label}
      </AppText>
      <TextInput
        ref={ref}
        testID={testID}
        accessibilityLabel={label}
        aria-invalid={Boolean(error)}
        placeholderTextColor={colors.textMuted}
        onFocus={(e) => {
          setFocused(true);
          onFocus?.(e);
        }}
        onBlur={(e) => {
          setFocused(false);
          onBlur?.(e);
        }}
        style={[styles.input, focused && styles.focused, error ? styles.invalid : null]}
        {...rest}
      />
      {error ? (
        <AppText variant="small" color={colors.danger} testID={`${testID}-error`} accessibilityRole="alert">
          {error}
        </AppText>
      ) : null}
    </View>
  );
});

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  input: {
    minHeight: 48,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    backgroundColor: colors.surface,
    paddingHorizontal: space.md,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.text,
  },
  focused: { borderColor: colors.focus },
  invalid: { borderColor: colors.danger },
});
