import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { Button } from '@/ui/button';
import { FormDateField } from '@/ui/form-date-field';
import { FormTextField } from '@/ui/form-text-field';
import { space } from '@/ui/theme';
import { isCalendarDate } from '@/shared/protocol/dates';

const day = z
  .string()
  .trim()
  .refine((v) => v === '' || isCalendarDate(v), {
    error: 'Choose a day on the calendar, or type it as YYYY-MM-DD.',
  });

export const auditFilterSchema = z
  .object({ client: z.string().trim().max(120), from: day, to: day })
  .refine((f) => !f.from || !f.to || f.from <= f.to, {
    error: 'The end date is before the start date.',
    path: ['to'],
  });
export type AuditFilterValues = z.infer<typeof auditFilterSchema>;
export const emptyAuditFilter: AuditFilterValues = { client: '', from: '', to: '' };

export function AuditFilters({ onApply }: { onApply: (values: AuditFilterValues) => void }) {
  const form = useForm<AuditFilterValues>({
    resolver: zodResolver(auditFilterSchema),
    defaultValues: emptyAuditFilter,
  });
  const apply = form.handleSubmit(onApply);
  return (
    <View style={styles.row}>
      <View style={styles.field}>
        <FormTextField
          control={form.control}
          name="client"
          label="Client"
          testID="audit-filter-client"
          placeholder="Part of a name"
          autoCapitalize="words"
          onSubmitEditing={() => void apply()}
        />
      </View>
      <View style={styles.field}>
        <FormDateField control={form.control} name="from" label="From" testID="audit-filter-from" />
      </View>
      <View style={styles.field}>
        <FormDateField control={form.control} name="to" label="To" testID="audit-filter-to" />
      </View>
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
  field: { flexBasis: 170, flexGrow: 1, maxWidth: 320 },
  buttons: { flexDirection: 'row', gap: space.xs, paddingBottom: 2 },
});
