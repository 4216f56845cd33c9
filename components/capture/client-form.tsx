import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { space } from '@/constants/theme';

const isoDate = /^\d{4}-\d{2}-\d{2}$/;

function realPastDate(value: string): boolean {
  if (!isoDate.test(value)) return false;
  const date = new Date(`${value}T00:00:00Z`);
  return (
    !Number.isNaN(date.getTime()) &&
    date.toISOString().startsWith(value) &&
    date.getTime() <= Date.now() &&
    date.getUTCFullYear() >= 1900
  );
}

export const clientFormSchema = z.object({
  firstName: z
    .string()
    .trim()
    .min(1, { error: 'Enter the first name.' })
    .max(80, { error: 'At most 80 characters.' }),
  lastName: z
    .string()
    .trim()
    .min(1, { error: 'Enter the last name.' })
    .max(80, { error: 'At most 80 characters.' }),
  dateOfBirth: z
    .string()
    .trim()
    .refine((v) => v === '' || realPastDate(v), {
      error: 'Use the form YYYY-MM-DD, a real date in the past.',
    }),
  email: z
    .string()
    .trim()
    .refine((v) => v === '' || z.email().safeParse(v).success, {
      error: 'Enter an e-mail address like name@example.com, or leave it empty.',
    }),
  phone: z
    .string()
    .trim()
    .refine((v) => v === '' || /^[+0-9 ()-]{6,20}$/.test(v), {
      error: 'Digits, spaces and + ( ) - only, 6 to 20 characters.',
    }),
});
export type ClientFormValues = z.infer<typeof clientFormSchema>;

type Props = { onSubmit: (values: ClientFormValues) => Promise<void>; submitLabel?: string };

export function ClientForm({ onSubmit, submitLabel = 'Add client' }: Props) {
  const {
    control,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<ClientFormValues>({
    resolver: zodResolver(clientFormSchema),
    defaultValues: { firstName: '', lastName: '', dateOfBirth: '', email: '', phone: '' },
  });
  const field = (name: keyof ClientFormValues, label: string, extra: Record<string, unknown> = {}) => (
    <Controller
      control={control}
      name={name}
      render={({ field: { value, onChange, onBlur } }) => (
        <TextField
          label={label}
          testID={`client-${name}`}
          value={value}
          onChangeText={onChange}
          onBlur={onBlur}
          error={errors[name]?.message}
          {...extra}
        />
      )}
    />
  );
  return (
    <View style={styles.root} testID="client-form">
      {field('firstName', 'First name', { autoComplete: 'off' })}
      {field('lastName', 'Last name', { autoComplete: 'off' })}
      {field('dateOfBirth', 'Date of birth (optional, YYYY-MM-DD)', { placeholder: '1980-04-23' })}
      {field('email', 'E-mail (optional, for consent and reports)', {
        autoCapitalize: 'none',
        keyboardType: 'email-address',
      })}
      {field('phone', 'Phone (optional)', { keyboardType: 'phone-pad' })}
      <Button
        label={submitLabel}
        onPress={handleSubmit(onSubmit)}
        testID="client-submit"
        busy={isSubmitting}
      />
    </View>
  );
}

const styles = StyleSheet.create({ root: { gap: space.md } });
