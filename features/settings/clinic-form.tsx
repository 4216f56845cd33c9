import { zodResolver } from '@hookform/resolvers/zod';
import * as DocumentPicker from 'expo-document-picker';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Image, StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { SubmitButton } from '@/ui/submit-button';
import { FormTextField } from '@/ui/form-text-field';
import { isTimeZone } from '@/shared/format/dates';
import { setDisplayTimeZone } from '@/ui/format';
import { colors, radii, space } from '@/ui/theme';
import type { ClinicSettings } from '@/shared/protocol/practice';

const wholeNumber = (label: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .refine((v) => /^\d+$/.test(v) && Number(v) >= min && Number(v) <= max, {
      error: `${label}: a whole number from ${min} to ${max}.`,
    });

const formSchema = z.object({
  name: z
    .string()
    .trim()
    .min(1, { error: 'Clinic name is required.' })
    .max(120, { error: 'At most 120 characters.' }),
  address: z.string().trim().max(500, { error: 'At most 500 characters.' }),
  logoDataUrl: z.string().nullable(),
  retentionMonths: wholeNumber('Months', 1, 600),
  reminderDaysBefore: wholeNumber('Days', 0, 60),
  timeZone: z
    .string()
    .trim()
    .refine(isTimeZone, { error: 'Use a time zone name such as Europe/Lisbon or America/Chicago.' }),
});
type FormValues = z.infer<typeof formSchema>;

const maxLogoBytes = 300 * 1024;

async function pickLogo(): Promise<{ dataUrl: string } | { error: string } | null> {
  const picked = await DocumentPicker.getDocumentAsync({
    type: ['image/png', 'image/jpeg'],
    multiple: false,
  });
  if (picked.canceled || !picked.assets[0]) return null;
  const asset = picked.assets[0];
  if (asset.mimeType && !['image/png', 'image/jpeg'].includes(asset.mimeType)) {
    return { error: 'The logo must be a PNG or JPEG image.' };
  }
  if (asset.size && asset.size > maxLogoBytes)
    return { error: 'The logo is too large; use an image under 300 KB.' };
  const blob = await (await fetch(asset.uri)).blob();
  const dataUrl = await new Promise<string>((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(String(reader.result));
    reader.onerror = () => reject(new Error('Could not read the image.'));
    reader.readAsDataURL(blob);
  });
  return { dataUrl };
}

/** Name, address and logo printed on reports; how long records are kept; when reminders go out. */
export function ClinicForm({
  settings,
  onSave,
}: {
  settings: ClinicSettings;
  onSave: (settings: ClinicSettings) => Promise<unknown>;
}) {
  const form = useForm<FormValues>({
    resolver: zodResolver(formSchema),
    values: {
      name: settings.name,
      address: settings.address ?? '',
      logoDataUrl: settings.logoDataUrl ?? null,
      retentionMonths: String(settings.retentionMonths),
      reminderDaysBefore: String(settings.reminderDaysBefore),
      timeZone: settings.timeZone ?? 'UTC',
    },
  });
  const [message, setMessage] = useState<{ text: string; error: boolean } | null>(null);
  const logo = form.watch('logoDataUrl');
  const zone = form.watch('timeZone');
  const deviceZone = Intl.DateTimeFormat().resolvedOptions().timeZone;

  const submit = form.handleSubmit(async (v) => {
    setMessage(null);
    try {
      await onSave({
        ...settings,
        name: v.name,
        address: v.address || null,
        logoDataUrl: v.logoDataUrl,
        retentionMonths: Number(v.retentionMonths),
        reminderDaysBefore: Number(v.reminderDaysBefore),
        timeZone: v.timeZone,
      });
      setDisplayTimeZone(v.timeZone);
      setMessage({ text: 'Saved.', error: false });
    } catch (error) {
      setMessage({ text: error instanceof Error ? error.message : 'Could not save.', error: true });
    }
  });

  const text = (
    name: 'name' | 'address' | 'retentionMonths' | 'reminderDaysBefore' | 'timeZone',
    label: string,
    multiline = false,
  ) => (
    <FormTextField
      control={form.control}
      name={name}
      label={label}
      testID={`settings-${name}`}
      multiline={multiline}
      numberOfLines={multiline ? 3 : undefined}
      inputMode={multiline || name === 'name' || name === 'timeZone' ? 'text' : 'numeric'}
    />
  );

  return (
    <View style={styles.form}>
      <View style={styles.grid}>
        <View style={styles.cell}>{text('name', 'Clinic name')}</View>
        <View style={styles.cell}>{text('address', 'Address', true)}</View>
      </View>
      <View style={styles.logoRow}>
        <View style={styles.logoBox} testID="settings-logo-preview">
          {logo ? (
            <Image
              source={{ uri: logo }}
              style={styles.logo}
              resizeMode="contain"
              accessibilityLabel="Clinic logo"
            />
          ) : (
            <AppText variant="caption" color={colors.textMuted}>
              NO LOGO
            </AppText>
          )}
        </View>
        <View style={styles.logoActions}>
          <AppText variant="smallStrong" color={colors.ink}>
            Logo for reports
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            PNG or JPEG, under 300 KB.
          </AppText>
          <View style={styles.buttons}>
            <Button
              label={logo ? 'Replace logo' : 'Choose logo'}
              variant="secondary"
              testID="settings-logo-pick"
              onPress={() =>
                void pickLogo().then(
                  (picked) => {
                    if (!picked) return;
                    if ('error' in picked) return setMessage({ text: picked.error, error: true });
                    form.setValue('logoDataUrl', picked.dataUrl, { shouldDirty: true });
                  },
                  (error: unknown) =>
                    setMessage({
                      text: error instanceof Error ? error.message : 'Could not read the image.',
                      error: true,
                    }),
                )
              }
            />
            {logo ? (
              <Button
                label="Remove"
                variant="ghost"
                testID="settings-logo-remove"
                onPress={() => form.setValue('logoDataUrl', null, { shouldDirty: true })}
              />
            ) : null}
          </View>
        </View>
      </View>
      <View style={styles.grid}>
        <View style={styles.cell}>{text('retentionMonths', 'Keep records for (months)')}</View>
        <View style={styles.cell}>
          {text('reminderDaysBefore', 'Send follow-up reminders (days before)')}
        </View>
      </View>
      <View style={styles.grid}>
        <View style={styles.cell}>
          {text('timeZone', 'Time zone of the clinic')}
          {deviceZone && deviceZone !== zone ? (
            <Button
              label={`Use this device's zone (${deviceZone})`}
              variant="ghost"
              testID="settings-timeZone-device"
              onPress={() =>
                form.setValue('timeZone', deviceZone, { shouldDirty: true, shouldValidate: true })
              }
            />
          ) : null}
        </View>
        <View style={styles.cell}>
          <AppText variant="small" color={colors.textMuted}>
            Visit days, follow-up dates, reminders and the times on reports are written in this zone, for
            everyone in the clinic.
          </AppText>
        </View>
      </View>
      <AppText variant="small" color={colors.textMuted}>
        Records older than the retention period are due for review; follow local rules on how long health
        records must be kept.
      </AppText>
      <SubmitButton
        inline
        label="Save clinic settings"
        onPress={() => void submit()}
        busy={form.formState.isSubmitting}
        testID="settings-save"
        outcome={message}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  cell: { flexBasis: 280, flexGrow: 1 },
  logoRow: { flexDirection: 'row', gap: space.lg, alignItems: 'center', flexWrap: 'wrap' },
  logoBox: {
    width: 120,
    height: 80,
    borderRadius: radii.md,
    borderWidth: 1,
    borderColor: colors.line,
    borderStyle: 'dashed',
    alignItems: 'center',
    justifyContent: 'center',
    backgroundColor: colors.paper,
  },
  logo: { width: 110, height: 70 },
  logoActions: { gap: space.xs },
  buttons: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
});
