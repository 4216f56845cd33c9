import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, type Control } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { SubmitButton } from '@/ui/submit-button';
import { FormDateField } from '@/ui/form-date-field';
import { FormTextField } from '@/ui/form-text-field';
import { displayTimeZone } from '@/ui/format';
import { todayIn } from '@/shared/format/dates';
import { Panel } from '@/ui/panel';
import { colors, space } from '@/ui/theme';
import { ApiFailure } from '@/api/result';
import { clientDetailsSchema, type ClientDetails, type ClientRecord } from '@/shared/protocol/practice';

type FormValues = {
  firstName: string;
  lastName: string;
  dateOfBirth: string;
  email: string;
  phone: string;
  notes: string;
};
type FieldName = keyof FormValues;

const realDate = (v: string) => {
  const d = new Date(`${v}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === v;
};

// The form holds plain strings and checks each field at once; blanks become nulls before the shared schema
// (lengths and the server's own rules) checks the whole.
const formSchema = z
  .object({
    firstName: z.string().trim().min(1, { error: 'First name is required.' }),
    lastName: z.string().trim().min(1, { error: 'Last name is required.' }),
    dateOfBirth: z
      .string()
      .trim()
      .refine((v) => v === '' || (/^\d{4}-\d{2}-\d{2}$/.test(v) && realDate(v)), {
        error: 'Use a real date like 1984-03-31.',
      })
      .refine((v) => v === '' || v <= todayIn(displayTimeZone()), {
        error: 'The date of birth cannot be in the future.',
      }),
    email: z
      .string()
      .trim()
      .refine((v) => v === '' || z.email().safeParse(v).success, { error: 'Enter a valid e-mail address.' }),
    phone: z.string(),
    notes: z.string(),
  })
  .transform((v, ctx): ClientDetails => {
    const checked = clientDetailsSchema.safeParse({
      ...v,
      dateOfBirth: v.dateOfBirth || null,
      email: v.email || null,
    });
    if (checked.success) return checked.data;
    for (const issue of checked.error.issues) {
      ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
    }
    return z.NEVER;
  });

const toForm = (c: ClientRecord['client']): FormValues => ({
  firstName: c.firstName,
  lastName: c.lastName,
  dateOfBirth: c.dateOfBirth ?? '',
  email: c.email ?? '',
  phone: c.phone ?? '',
  notes: c.notes ?? '',
});

export const isStaleEdit = (error: unknown) =>
  error instanceof ApiFailure && error.result.kind === 'rejected' && error.result.status === 409;

function Field({
  control,
  name,
  label,
  multiline = false,
}: {
  control: Control<FormValues, unknown, ClientDetails>;
  name: FieldName;
  label: string;
  multiline?: boolean;
}) {
  return (
    <View style={multiline ? styles.full : styles.half}>
      <FormTextField
        control={control}
        name={name}
        label={label}
        testID={`client-field-${name}`}
        multiline={multiline}
        numberOfLines={multiline ? 5 : undefined}
        autoCapitalize={name === 'email' ? 'none' : 'sentences'}
      />
    </View>
  );
}

type Props = {
  client: ClientRecord['client'];
  /** Saves against `version`; resolves with the record as stored. */
  onSave: (details: ClientDetails & { version: number }) => Promise<ClientRecord>;
  /** Fetches the record as it is now on the server. */
  onReload: () => Promise<ClientRecord | undefined>;
};

/** Contact details, date of birth and notes; a save made on an outdated copy is refused and nothing is lost. */
export function ClientDetailsForm({ client, onSave, onReload }: Props) {
  const form = useForm<FormValues, unknown, ClientDetails>({
    resolver: zodResolver(formSchema),
    defaultValues: toForm(client),
  });
  const [version, setVersion] = useState(client.version);
  const [stale, setStale] = useState(false);
  const [message, setMessage] = useState<{ text: string; error: boolean } | null>(null);

  const save = (details: ClientDetails, basedOn: number) =>
    onSave({ ...details, version: basedOn }).then(
      (saved) => {
        setStale(false);
        setVersion(saved.client.version);
        form.reset(toForm(saved.client));
        setMessage({ text: 'Saved.', error: false });
      },
      (error: unknown) => {
        if (isStaleEdit(error)) {
          setStale(true);
          setMessage(null);
        } else {
          setMessage({ text: error instanceof Error ? error.message : 'Could not save.', error: true });
        }
      },
    );

  const submit = form.handleSubmit((details) => save(details, version));

  const keepMine = form.handleSubmit(async (details) => {
    const latest = await onReload();
    if (latest) await save(details, latest.client.version);
  });

  const takeTheirs = async () => {
    const latest = await onReload();
    if (!latest) return;
    setVersion(latest.client.version);
    form.reset(toForm(latest.client));
    setStale(false);
    setMessage({ text: 'Loaded the latest version; your unsaved changes were discarded.', error: false });
  };

  return (
    <Panel title="Details" detail="Contact details, date of birth and notes." testID="client-details">
      <View style={styles.grid}>
        <Field control={form.control} name="firstName" label="First name" />
        <Field control={form.control} name="lastName" label="Last name" />
        <View style={styles.half}>
          <FormDateField
            control={form.control}
            name="dateOfBirth"
            label="Date of birth"
            testID="client-field-dateOfBirth"
            max={todayIn(displayTimeZone())}
            farDates
          />
        </View>
        <Field control={form.control} name="email" label="E-mail" />
        <Field control={form.control} name="phone" label="Phone" />
        <Field control={form.control} name="notes" label="Notes" multiline />
      </View>
      {stale ? (
        <View style={styles.stale} testID="client-stale" accessibilityRole="alert">
          <AppText variant="bodyStrong" color={colors.caution}>
            Someone else changed this record while you were editing
          </AppText>
          <AppText variant="small" color={colors.text}>
            Nothing was saved, and your changes are still in the form. Save them over the other change, or
            discard them and load the latest version.
          </AppText>
          <View style={styles.buttons}>
            <Button
              label="Save mine over theirs"
              onPress={() => void keepMine()}
              testID="client-stale-keep"
            />
            <Button
              label="Discard mine, load latest"
              variant="secondary"
              onPress={() => void takeTheirs()}
              testID="client-stale-reload"
            />
          </View>
        </View>
      ) : null}
      <SubmitButton
        inline
        label="Save details"
        onPress={() => void submit()}
        busy={form.formState.isSubmitting}
        disabled={stale}
        testID="client-save"
        outcome={message}
      />
    </Panel>
  );
}

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  half: { flexGrow: 1, flexBasis: 260 },
  full: { flexBasis: '100%' },
  buttons: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  stale: {
    gap: space.sm,
    padding: space.md,
    borderRadius: 10,
    borderWidth: 1,
    borderColor: colors.cautionLine,
    backgroundColor: colors.cautionSoft,
  },
});
