import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useLocalSearchParams } from 'expo-router';
import { useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { failureOf, SubmitButton } from '@/ui/submit-button';
import { FormTextField } from '@/ui/form-text-field';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { colors } from '@/ui/theme';
import { useCompletePasswordResetMutation, usePasswordResetPreviewQuery } from './api';
import type { ApiFailure } from '@/api/result';
import { newPasswordSchemaFor, PASSWORD_MIN_LENGTH } from '@/shared/protocol';
import { PublicCard } from './public-card';

function ToSignIn() {
  return (
    <Link href="/sign-in" testID="reset-to-sign-in">
      <AppText variant="smallStrong" color={colors.accent}>
        Go to sign-in
      </AppText>
    </Link>
  );
}

/** The page a reset e-mail's link opens: a new password under the same rule as an invitation's. */
export function ResetPasswordScreen() {
  const { token } = useLocalSearchParams<{ token: string }>();
  const preview = usePasswordResetPreviewQuery(String(token ?? ''));
  const complete = useCompletePasswordResetMutation(String(token ?? ''));
  const email = preview.data?.email ?? '';
  const schema = useMemo(() => z.object({ password: newPasswordSchemaFor(email) }), [email]);
  const form = useForm<{ password: string }>({
    resolver: zodResolver(schema),
    defaultValues: { password: '' },
  });

  let body;
  if (preview.isPending) body = <LoadingState label="Checking the link…" testID="reset-loading" />;
  else if (preview.isError && (preview.error as ApiFailure).temporary)
    body = (
      <ErrorState
        message={preview.error.message}
        onRetry={() => void preview.refetch()}
        testID="reset-offline"
      />
    );
  else if (preview.isError)
    body = (
      <>
        <AppText variant="title" color={colors.ink}>
          This link can no longer be used
        </AppText>
        <AppText color={colors.text} testID="reset-invalid">
          {preview.error.message}
        </AppText>
        <Link href="/forgot-password" testID="reset-ask-again">
          <AppText variant="smallStrong" color={colors.accent}>
            Ask for a new link
          </AppText>
        </Link>
        <ToSignIn />
      </>
    );
  else if (complete.isSuccess)
    body = (
      <>
        <AppText variant="title" color={colors.ink} testID="reset-done">
          Your new password is set
        </AppText>
        <AppText color={colors.text}>{complete.data.message}</AppText>
        <ToSignIn />
      </>
    );
  else
    body = (
      <>
        <AppText variant="title" color={colors.ink}>
          Choose a new password
        </AppText>
        <AppText color={colors.textMuted}>
          For {preview.data.email}. Use at least {PASSWORD_MIN_LENGTH} characters that do not contain your
          e-mail address: a few unrelated words work well. Common or easily guessed passwords are refused.
        </AppText>
        <FormTextField
          control={form.control}
          name="password"
          label="New password"
          testID="reset-password"
          secureTextEntry
          autoComplete="new-password"
        />
        <SubmitButton
          label="Set the new password"
          busy={complete.isPending}
          testID="reset-submit"
          onPress={() => void form.handleSubmit((values) => complete.mutate(values))()}
          outcome={failureOf(complete)}
        />
      </>
    );
  return <PublicCard testID="reset-password-screen">{body}</PublicCard>;
}
