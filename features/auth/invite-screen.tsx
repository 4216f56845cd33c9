import { zodResolver } from '@hookform/resolvers/zod';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { useEffect, useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { failureOf, SubmitButton } from '@/ui/submit-button';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { FormTextField } from '@/ui/form-text-field';
import { colors } from '@/ui/theme';
import type { ApiFailure } from '@/api/result';
import { useAcceptInvitationMutation, useInvitationPreviewQuery } from '@/features/team/api';
import { PublicCard } from './public-card';
import { newPasswordSchemaFor, PASSWORD_MIN_LENGTH } from '@/shared/protocol';
import { acceptInvitationRequestSchema, type AcceptInvitationRequest } from '@/shared/protocol/practice';

/** The page an invitation link opens: the invitee sets a password; then they sign in as usual. */
export function InviteScreen() {
  const { token } = useLocalSearchParams<{ token: string }>();
  const router = useRouter();
  const preview = useInvitationPreviewQuery(String(token ?? ''));
  const accept = useAcceptInvitationMutation(String(token ?? ''));
  const invitedEmail = preview.data?.email ?? '';
  // The same rule as the server's, less the common-password check (its dictionaries stay on the server).
  const schema = useMemo(
    () => acceptInvitationRequestSchema.extend({ password: newPasswordSchemaFor(invitedEmail) }),
    [invitedEmail],
  );
  const form = useForm<AcceptInvitationRequest>({
    resolver: zodResolver(schema),
    defaultValues: { email: '', name: '', password: '' },
  });
  // The invited address and name go into the form itself, so accepting them as shown submits them; the server
  // makes the account only for the address the invitation was sent to.
  const invitedName = preview.data?.name;
  useEffect(() => {
    if (invitedEmail && !form.getValues('email')) form.setValue('email', invitedEmail);
    if (invitedName && !form.getValues('name')) form.setValue('name', invitedName);
  }, [invitedEmail, invitedName, form]);

  return (
    <PublicCard testID="invite-screen">
      {preview.isPending ? (
        <LoadingState label="Checking the invitation…" testID="invite-loading" />
      ) : preview.isError && (preview.error as ApiFailure).temporary ? (
        <ErrorState
          message={preview.error.message}
          onRetry={() => void preview.refetch()}
          testID="invite-offline"
        />
      ) : preview.isError ? (
        // Used, withdrawn, expired or not valid: say which, and lead to sign-in (the account may exist already).
        <>
          <AppText variant="title" color={colors.ink}>
            This invitation can no longer be used
          </AppText>
          <AppText color={colors.text} testID="invite-invalid">
            {preview.error.message}
          </AppText>
          <Button
            label="Go to sign-in"
            onPress={() => router.replace('/sign-in')}
            testID="invite-invalid-sign-in"
          />
        </>
      ) : accept.isSuccess ? (
        <>
          <AppText variant="title" color={colors.ink} testID="invite-done">
            Your account is ready
          </AppText>
          <AppText color={colors.text}>
            Sign in with {preview.data.email} and the password you just chose.
          </AppText>
          <Button
            label="Go to sign-in"
            onPress={() => router.replace('/sign-in')}
            testID="invite-to-sign-in"
          />
        </>
      ) : (
        <>
          <AppText variant="title" color={colors.ink}>
            Join {preview.data.clinicName}
          </AppText>
          <AppText color={colors.textMuted}>
            {preview.data.email} is invited as {preview.data.role}. Choose a password of at least{' '}
            {PASSWORD_MIN_LENGTH} characters that does not contain your e-mail address: a few unrelated words
            work well. Common or easily guessed passwords are refused.
          </AppText>
          <FormTextField
            control={form.control}
            name="email"
            label="Your e-mail address"
            testID="invite-accept-email"
            keyboardType="email-address"
            autoCapitalize="none"
          />
          <FormTextField control={form.control} name="name" label="Your name" testID="invite-accept-name" />
          <FormTextField
            control={form.control}
            name="password"
            label="Password"
            testID="invite-accept-password"
            secureTextEntry
          />
          <SubmitButton
            label="Set password"
            busy={accept.isPending}
            testID="invite-accept"
            onPress={() => void form.handleSubmit((v) => accept.mutate(v))()}
            outcome={failureOf(accept)}
          />
        </>
      )}
    </PublicCard>
  );
}
