import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { Button } from '@/ui/button';
import { FormTextField } from '@/ui/form-text-field';
import { space } from '@/ui/theme';
import { isCalendarDate } from '@/shared/protocol/dates';

const day = z
  .string()
  .trim()
  .refine((v) => v === '' || isCalendarDate(v), {
    error: 'Use a date like 2026-03-31.',
  });

export const auditFilterSchema = z
  .object({ client: z.string().trim().max(120), from: day, to: day })
  .refine((f) => !f.from || !f.to || f.from <= f.to, {
    error: 'The end date is before the start date.',
    path: ['to'],
  });
export type AuditFilterValues = z.infer<typeof auditFilterSchema>;
export const emptyAuditFilter: AuditFilterValues = { client: '', from: '', to: '' };

const fields: { name: keyof AuditFilterValues; label: string; hint: string }[] = [
  { name: 'client', label: 'Client', hint: 'Part of a name' },
  { name: 'from', label: 'From', hint: 'YYYY-MM-DD' },
  { name: 'to', label: 'To', hint: 'YYYY-MM-DD' },
];

export function AuditFilters({ onApply }: { onApply: (values: AuditFilterValues) => void }) {
  const form = useForm<AuditFilterValues>({
    resolver: zodResolver(auditFilterSchema),
    defaultValues: emptyAuditFilter,
  });
  const apply = form.handleSubmit(onApply);
  return (
    <View style={styles.row}>
      {fields.map((f) => (
        <View key={f.name} style={styles.field}>
          <FormTextField
            control={form.control}
            name={f.name}
            label={f.label}
            testID={`audit-filter-${f.name}`}
            placeholder={f.hint}
            autoCapitalize={f.name === 'client' ? 'words' : 'none'}
            onSubmitEditing={() => void apply()}
          />
        </View>
      ))}
      <View style={styles.buttons}>
        <Button label="Apply" onPress={() => void apply()} testID="audit-filter-apply" />
        <Button
          label="Clear"
          variant="ghost"
          onPress={() => {
            form.reset(emptyAuditFilter);
            onApply(emptyAuditFilter);
          }}
          testID="audit-filter-clear"
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
  field: { flexBasis: 170, flexGrow: 1, maxWidth: 240 },
  buttons: { flexDirection: 'row', gap: space.xs, paddingBottom: 2 },
});
