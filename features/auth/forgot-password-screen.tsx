import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'expo-router';
import { useForm } from 'react-hook-form';
import { AppText } from '@/ui/app-text';
import { failureOf, SubmitButton } from '@/ui/submit-button';
import { FormTextField } from '@/ui/form-text-field';
import { colors } from '@/ui/theme';
import { useRequestPasswordResetMutation } from './api';
import { passwordResetRequestSchema, type PasswordResetRequest } from '@/shared/protocol';
import { PublicCard } from './public-card';

/** "Forgot password?": asks for the address; the answer is the same whether or not an account uses it. */
export function ForgotPasswordScreen() {
  const ask = useRequestPasswordResetMutation();
  const form = useForm<PasswordResetRequest>({
    resolver: zodResolver(passwordResetRequestSchema),
    defaultValues: { email: '' },
  });
  return (
    <PublicCard testID="forgot-password-screen">
      <AppText variant="title" color={colors.ink}>
        Choose a new password
      </AppText>
      {ask.isSuccess ? (
        <AppText color={colors.text} testID="forgot-password-sent">
          {ask.data.message}
        </AppText>
      ) : (
        <>
          <AppText color={colors.textMuted}>
            Enter the e-mail address you sign in with. We will send it a link to choose a new password.
          </AppText>
          <FormTextField
            control={form.control}
            name="email"
            label="E-mail"
            testID="forgot-password-email"
            keyboardType="email-address"
            autoCapitalize="none"
            autoComplete="email"
          />
          <SubmitButton
            label="Send the link"
            busy={ask.isPending}
            testID="forgot-password-submit"
            onPress={() => void form.handleSubmit((values) => ask.mutate(values))()}
            outcome={failureOf(ask)}
          />
        </>
      )}
      <Link href="/sign-in" testID="forgot-password-to-sign-in">
        <AppText variant="smallStrong" color={colors.accent}>
          Back to sign-in
        </AppText>
      </Link>
    </PublicCard>
  );
}
