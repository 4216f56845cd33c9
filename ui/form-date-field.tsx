import type { ComponentProps } from 'react';
import type { FieldValues } from 'react-hook-form';
import { DateField } from './date-field';
import { useFormBinding, type FormBinding } from './form-binding';

type Props<T extends FieldValues, TTransformed> = Omit<
  ComponentProps<typeof DateField>,
  'value' | 'onChange' | 'onBlur' | 'error'
> &
  FormBinding<T, TTransformed>;

/** A date field bound to a react-hook-form field (a YYYY-MM-DD string, '' for none). */
export function FormDateField<T extends FieldValues, TTransformed = T>({
  control,
  name,
  ...fieldProps
}: Props<T, TTransformed>) {
  const bound = useFormBinding({ control, name });
  return <DateField {...fieldProps} {...bound} value={bound.value ?? ''} />;
}
