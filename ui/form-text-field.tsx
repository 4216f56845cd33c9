import type { ComponentProps, Ref } from 'react';
import type { TextInput } from 'react-native';
import type { FieldValues } from 'react-hook-form';
import { useFormBinding, type FormBinding } from './form-binding';
import { TextField } from './text-field';

type Props<T extends FieldValues, TTransformed> = Omit<
  ComponentProps<typeof TextField>,
  'value' | 'onChangeText' | 'onBlur' | 'error' | 'ref'
> &
  FormBinding<T, TTransformed> & {
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
  const { onChange, ...bound } = useFormBinding({ control, name });
  return <TextField {...fieldProps} {...bound} ref={ref} onChangeText={onChange} />;
}
