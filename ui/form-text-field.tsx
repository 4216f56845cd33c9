import type { ComponentProps, Ref } from 'react';
import type { TextInput } from 'react-native';
import { Controller, type Control, type FieldPath, type FieldValues } from 'react-hook-form';
import { TextField } from './text-field';

type Props<T extends FieldValues, TTransformed> = Omit<
  ComponentProps<typeof TextField>,
  'value' | 'onChangeText' | 'onBlur' | 'error' | 'ref'
> & {
  control: Control<T, unknown, TTransformed>;
  name: FieldPath<T>;
  /** The text input itself, e.g. to move focus to this field from the one before. */
  ref?: Ref<TextInput>;
};

/** A text field bound to a react-hook-form field: value, change, blur and the field's error message. */
export function FormTextField<T extends FieldValues, TTransformed = T>({
  control,
  name,
  ref,
  ...fieldProps
}: Props<T, TTransformed>) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field, fieldState }) => (
        <TextField
          {...fieldProps}
          ref={ref}
          value={field.value}
          onChangeText={field.onChange}
          onBlur={field.onBlur}
          error={fieldState.error?.message}
        />
      )}
    />
  );
}
