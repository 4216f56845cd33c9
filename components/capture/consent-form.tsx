import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/components/ui/app-text';
import { Button } from '@/components/ui/button';
import { FormTextField } from '@/components/ui/form-text-field';
import { colors, radii, space } from '@/constants/theme';
import type { ShownConsentText } from '@/hooks/consent/clinic-consent-text';
import { isCalendarDate } from '@/shared/protocol/dates';

function today(): string {
  const now = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

export function consentFormSchema(clientName: string) {
  const normal = (s: string) => s.trim().toLowerCase().replace(/\s+/g, ' ');
  return z.object({
    signedName: z
      .string()
      .trim()
      .min(1, { error: 'The client types their full name to consent.' })
      .refine((v) => normal(v) === normal(clientName), {
        error: `Type the name exactly as on file: ${clientName}.`,
      }),
    signedOn: z
      .string()
      .trim()
      .refine(isCalendarDate, { error: 'Use the form YYYY-MM-DD.' })
      .refine((v) => v === today(), { error: 'Consent is dated today.' }),
  });
}
export type ConsentFormValues = { signedName: string; signedOn: string };

type Props = {
  clientName: string;
  /** The wording shown and the version recorded (the clinic's published text, or the built-in one). */
  text: ShownConsentText;
  onSubmit: (values: ConsentFormValues & { textVersion: string }) => Promise<void>;
};

export function ConsentForm({ clientName, text: shown, onSubmit }: Props) {
  const {
    control,
    handleSubmit,
    formState: { isSubmitting },
  } = useForm<ConsentFormValues>({
    resolver: zodResolver(consentFormSchema(clientName)),
    defaultValues: { signedName: '', signedOn: today() },
  });
  return (
    <View style={styles.root} testID="consent-form">
      <View style={styles.text}>
        <AppText variant="caption" color={colors.textMuted}>
          CONSENT · VERSION {shown.version}
        </AppText>
        {shown.paragraphs.map((p) => (
          <AppText key={p} variant="small" color={colors.text}>
            {p}
          </AppText>
        ))}
      </View>
      <FormTextField
        control={control}
        name="signedName"
        label="Client types their full name"
        testID="consent-name"
        autoComplete="off"
      />
      <FormTextField control={control} name="signedOn" label="Date" testID="consent-date" />
      <Button
        label="Record consent"
        onPress={handleSubmit((values) => onSubmit({ ...values, textVersion: String(shown.version) }))}
        testID="consent-submit"
        busy={isSubmitting}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.md },
  text: {
    gap: space.sm,
    padding: space.md,
    borderRadius: radii.md,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
  },
});
