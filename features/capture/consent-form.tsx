import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { FormTextField } from '@/ui/form-text-field';
import { formatDate } from '@/ui/format';
import { colors, radii, space } from '@/ui/theme';
import type { ShownConsentText } from '@/device/consent/clinic-consent-text';

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
  } = useForm<{ signedName: string }>({
    resolver: zodResolver(consentFormSchema(clientName)),
    defaultValues: { signedName: '' },
  });
  // Consent is signed in the room, so it is dated the day it is taken; the date is shown, not typed.
  const signedOn = today();
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
      <View style={styles.date}>
        <AppText variant="caption" color={colors.textMuted}>
          DATE
        </AppText>
        <AppText variant="body" color={colors.text} testID="consent-date">
          Today, {formatDate(signedOn)}
        </AppText>
      </View>
      <Button
        label="Record consent"
        onPress={handleSubmit((values) =>
          onSubmit({ ...values, signedOn, textVersion: String(shown.version) }),
        )}
        testID="consent-submit"
        busy={isSubmitting}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  root: { gap: space.md },
  date: { gap: 2 },
  text: {
    gap: space.sm,
    padding: space.md,
    borderRadius: radii.md,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
  },
});
