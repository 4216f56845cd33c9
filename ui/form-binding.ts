import { useController, type Control, type FieldPath, type FieldValues } from 'react-hook-form';

/** Which react-hook-form field a form field shows. */
export type FormBinding<T extends FieldValues, TTransformed> = {
  control: Control<T, unknown, TTransformed>;
  name: FieldPath<T>;
};

/** A react-hook-form field as our field components take it: its value, change, blur and error message. */
export function useFormBinding<T extends FieldValues, TTransformed>({
  control,
  name,
}: FormBinding<T, TTransformed>) {
  const { field, fieldState } = useController({ control, name });
  return {
    value: field.value,
    onChange: field.onChange,
    onBlur: field.onBlur,
    error: fieldState.error?.message,
  };
}
