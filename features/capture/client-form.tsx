import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { Button } from '@/ui/button';
import { FormDateField } from '@/ui/form-date-field';
import { FormTextField } from '@/ui/form-text-field';
import { displayTimeZone } from '@/ui/format';
import { todayIn } from '@/shared/format/dates';
import { space } from '@/ui/theme';
import { isCalendarDate } from '@/shared/protocol/dates';

function realPastDate(value: string): boolean {
  if (!isCalendarDate(value)) return false;
  const date = new Date(`${value}T00:00:00Z`);
  return date.getTime() <= Date.now() && date.getUTCFullYear() >= 1900;
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
      error: 'Choose a day in the past on the calendar, or type it as YYYY-MM-DD.',
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
    formState: { isSubmitting },
  } = useForm<ClientFormValues>({
    resolver: zodResolver(clientFormSchema),
    defaultValues: { firstName: '', lastName: '', dateOfBirth: '', email: '', phone: '' },
  });
  return (
    <View style={styles.root} testID="client-form">
      <FormTextField
        control={control}
        name="firstName"
        label="First name"
        testID="client-firstName"
        autoComplete="off"
      />
      <FormTextField
        control={control}
        name="lastName"
        label="Last name"
        testID="client-lastName"
        autoComplete="off"
      />
      <FormDateField
        control={control}
        name="dateOfBirth"
        label="Date of birth (optional)"
        testID="client-dateOfBirth"
        max={todayIn(displayTimeZone())}
        farDates
      />
      <FormTextField
        control={control}
        name="email"
        label="E-mail (optional, for consent and reports)"
        testID="client-email"
        autoCapitalize="none"
        keyboardType="email-address"
      />
      <FormTextField
        control={control}
        name="phone"
        label="Phone (optional)"
        testID="client-phone"
        keyboardType="phone-pad"
      />
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
