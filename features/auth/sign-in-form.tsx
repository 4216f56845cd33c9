import { zodResolver } from '@hookform/resolvers/zod';
import { useRef, useState } from 'react';
import { Link } from 'expo-router';
import { useForm } from 'react-hook-form';
import { StyleSheet, View, type TextInput } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { FormTextField } from '@/ui/form-text-field';
import { colors, radii, space } from '@/ui/theme';
import type { ApiResult } from '@/api/result';
import { offlineMessage } from '@/api/result';
import { z } from 'zod';
// The auth schemas alone: the '@/shared/protocol' barrel would build every API schema before sign-in can paint.
import { signInRequestSchema, type SignInRequest, type SignInResponse } from '@/shared/protocol/auth';

// Stray spaces and capitals in a typed e-mail are not the user's mistake: tidy before checking.
const formSchema = z.object({
  email: z.string().trim().toLowerCase().pipe(signInRequestSchema.shape.email),
  password: signInRequestSchema.shape.password,
});

type Props = { onSubmit: (values: SignInRequest) => Promise<ApiResult<SignInResponse>> };

export function messageForSignInFailure(result: Exclude<ApiResult<SignInResponse>, { kind: 'ok' }>): string {
  switch (result.kind) {
    case 'unauthorized':
    case 'rate-limited':
    case 'rejected':
      return result.message;
    case 'offline':
      return `${offlineMessage} Signing in needs the clinic server once; after that the device works offline.`;
    case 'server':
      return result.message;
    default:
      return 'Signing in failed. Try again, and tell your admin if it keeps happening.';
  }
}

export function SignInForm({ onSubmit }: Props) {
  const [formError, setFormError] = useState<string | null>(null);
  const passwordRef = useRef<TextInput>(null);
  const {
    control,
    handleSubmit,
    formState: { isSubmitting },
  } = useForm<z.input<typeof formSchema>, unknown, SignInRequest>({
    resolver: zodResolver(formSchema),
    defaultValues: { email: '', password: '' },
  });

  const submit = handleSubmit(async (values) => {
    setFormError(null);
    const result = await onSubmit(values);
    if (result.kind !== 'ok') setFormError(messageForSignInFailure(result));
  });

  return (
    <View style={styles.form} testID="sign-in-form">
      <FormTextField
        control={control}
        name="email"
        label="E-mail"
        testID="sign-in-email"
        autoCapitalize="none"
        autoComplete="email"
        keyboardType="email-address"
        inputMode="email"
        returnKeyType="next"
        onSubmitEditing={() => passwordRef.current?.focus()}
        placeholder="name@clinic.example"
      />
      <FormTextField
        ref={passwordRef}
        control={control}
        name="password"
        label="Password"
        testID="sign-in-password"
        secureTextEntry
        autoComplete="current-password"
        returnKeyType="go"
        onSubmitEditing={() => void submit()}
      />
      {formError ? (
        <View style={styles.formError} testID="sign-in-error" accessibilityRole="alert">
          <AppText variant="small" color={colors.danger}>
            {formError}
          </AppText>
        </View>
      ) : null}
      <Button label="Sign in" testID="sign-in-submit" busy={isSubmitting} onPress={() => void submit()} />
      <Link href="/forgot-password" testID="sign-in-forgot" style={styles.forgot}>
        <AppText variant="smallStrong" color={colors.accent}>
          Forgot password?
        </AppText>
      </Link>
    </View>
  );
}

const styles = StyleSheet.create({
  forgot: { alignSelf: 'center' },
  form: { gap: space.lg },
  formError: {
    backgroundColor: colors.dangerSoft,
    borderRadius: radii.md,
    padding: space.md,
    borderWidth: 1,
    borderColor: colors.danger,
  },
});
