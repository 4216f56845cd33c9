import { router } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ClientForm, type ClientFormValues } from '@/features/capture/client-form';
import { AppText } from '@/ui/app-text';
import { ScreenFrame } from '@/ui/screen-frame';
import { colors, radii, space } from '@/ui/theme';
import { useAddClient } from '@/device/local-store/queries';

const orNull = (v: string) => (v.trim() === '' ? null : v.trim());

export function NewClientScreen() {
  const add = useAddClient();
  const [error, setError] = useState<string | null>(null);
  const submit = async (values: ClientFormValues) => {
    setError(null);
    try {
      const client = await add.mutateAsync({
        firstName: values.firstName.trim(),
        lastName: values.lastName.trim(),
        dateOfBirth: orNull(values.dateOfBirth),
        email: orNull(values.email),
        phone: orNull(values.phone),
      });
      router.replace(`/clients/${client.id}`);
    } catch (e) {
      setError(
        e instanceof Error ? e.message : 'The client could not be saved. Nothing was lost; try again.',
      );
    }
  };
  return (
    <ScreenFrame
      title="New client"
      subtitle="Saved on this device first; it reaches the clinic with the next sync."
      testID="new-client-screen"
    >
      <View style={styles.column}>
        {error ? (
          <View style={styles.error} accessibilityRole="alert" testID="new-client-error">
            <AppText variant="small" color={colors.danger}>
              {error}
            </AppText>
          </View>
        ) : null}
        <ClientForm onSubmit={submit} />
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  column: { maxWidth: 560, width: '100%', gap: space.md },
  error: { padding: space.md, borderRadius: radii.md, backgroundColor: colors.dangerSoft },
});
