import type { ComponentProps } from 'react';
import { Controller, type Control, type FieldPath, type FieldValues } from 'react-hook-form';
import { DateField } from './date-field';

type Props<T extends FieldValues, TTransformed> = Omit<
  ComponentProps<typeof DateField>,
  'value' | 'onChange' | 'onBlur' | 'error'
> & {
  control: Control<T, unknown, TTransformed>;
  name: FieldPath<T>;
};

/** A date field bound to a react-hook-form field (a YYYY-MM-DD string, '' for none). */
export function FormDateField<T extends FieldValues, TTransformed = T>({
  control,
  name,
  ...fieldProps
}: Props<T, TTransformed>) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field, fieldState }) => (
        <DateField
          {...fieldProps}
          value={field.value ?? ''}
          onChange={field.onChange}
          onBlur={field.onBlur}
          error={fieldState.error?.message}
        />
      )}
    />
  );
}
