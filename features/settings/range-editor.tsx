import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { z } from 'zod';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { ChoiceChips } from '@/ui/choice-chips';
import { FormTextField } from '@/ui/form-text-field';
import { colors, space } from '@/ui/theme';
import { sites } from '@/shared/sites';
import type { Site } from '@/shared/protocol';
import type { ClinicRange, SetRangeRequest } from '@/shared/protocol/practice';

const limit = z
  .string()
  .trim()
  .refine((v) => v === '' || (/^-?\d+(\.\d+)?$/.test(v) && Number.isFinite(Number(v))), {
    error: 'Enter a number such as 60 or 0.45, or leave it blank for no limit.',
  });

/** Blank means no limit on that side; both sides are numbers in the measurement's unit. */
export const rangeFormSchema = z
  .object({ low: limit, high: limit })
  .refine((r) => r.low === '' || r.high === '' || Number(r.low) <= Number(r.high), {
    error: 'The low end must not be above the high end.',
    path: ['high'],
  })
  .transform((r): SetRangeRequest => ({
    low: r.low === '' ? null : Number(r.low),
    high: r.high === '' ? null : Number(r.high),
  }));
type RangeForm = z.input<typeof rangeFormSchema>;

const shown = (v: number | null) => (v === null ? '' : String(v));
const describe = (low: number | null, high: number | null, unit: string) =>
  low === null && high === null
    ? 'no limits'
    : low === null
      ? `up to ${high} ${unit}`
      : high === null
        ? `${low} ${unit} or more`
        : `${low}–${high} ${unit}`;

type RowProps = {
  range: ClinicRange;
  onSave: (range: ClinicRange, value: SetRangeRequest) => Promise<unknown>;
  onReset: (range: ClinicRange) => Promise<unknown>;
};

export function RangeRow({ range, onSave, onReset }: RowProps) {
  const id = `${range.metric}-${range.site}`;
  const form = useForm<RangeForm, unknown, SetRangeRequest>({
    resolver: zodResolver(rangeFormSchema),
    values: { low: shown(range.low), high: shown(range.high) },
  });
  const [failure, setFailure] = useState<string | null>(null);
  const run = async (action: () => Promise<unknown>) => {
    setFailure(null);
    try {
      await action();
    } catch (error) {
      setFailure(error instanceof Error ? error.message : 'Could not save the range.');
    }
  };
  const save = form.handleSubmit((value) => run(() => onSave(range, value)));

  return (
    <View style={styles.row} testID={`range-${id}`}>
      <View style={styles.what}>
        <View style={styles.title}>
          <AppText variant="smallStrong" color={colors.ink}>
            {range.label}
          </AppText>
          {range.overridden ? <Badge label="clinic's own" tone="ink" testID={`range-own-${id}`} /> : null}
        </View>
        <AppText variant="caption" color={colors.textMuted}>
          Default {describe(range.defaultLow, range.defaultHigh, range.unit)}. {range.source}
        </AppText>
      </View>
      <View style={styles.inputs}>
        {(['low', 'high'] as const).map((side) => (
          <View key={side} style={styles.input}>
            <FormTextField
              control={form.control}
              name={side}
              label={`${side === 'low' ? 'Low' : 'High'} (${range.unit})`}
              testID={`range-${side}-${id}`}
              inputMode="decimal"
              placeholder="no limit"
            />
          </View>
        ))}
        <View style={styles.buttons}>
          <Button
            label="Save"
            onPress={() => void save()}
            busy={form.formState.isSubmitting}
            disabled={!form.formState.isDirty}
            testID={`range-save-${id}`}
          />
          {range.overridden ? (
            <Button
              label="Reset"
              variant="ghost"
              onPress={() => void run(() => onReset(range))}
              testID={`range-reset-${id}`}
            />
          ) : null}
        </View>
      </View>
      {failure ? (
        <AppText variant="small" color={colors.danger} testID={`range-error-${id}`}>
          {failure}
        </AppText>
      ) : null}
    </View>
  );
}

type EditorProps = Omit<RowProps, 'range'> & { ranges: ClinicRange[] };

/** The clinic's reference ranges for one site at a time, each with its source. */
export function RangeEditor({ ranges, onSave, onReset }: EditorProps) {
  const [site, setSite] = useState<Site>('mitral');
  const forSite = ranges.filter((r) => r.site === site || r.site === 'all');
  return (
    <View style={styles.editor} testID="range-editor">
      <ChoiceChips
        label="Site"
        testID="range-site"
        value={site}
        onChange={setSite}
        choices={sites.map((s) => ({ value: s.id, label: s.label }))}
      />
      {forSite.length === 0 ? (
        <AppText color={colors.textMuted} testID="range-empty">
          No reference ranges are defined for this site yet.
        </AppText>
      ) : (
        forSite.map((r) => (
          <RangeRow key={`${r.metric}-${r.site}`} range={r} onSave={onSave} onReset={onReset} />
        ))
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  editor: { gap: space.md },
  row: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'flex-start',
    gap: space.md,
    paddingTop: space.md,
    borderTopWidth: 1,
    borderTopColor: colors.surfaceMuted,
  },
  what: { flexBasis: 320, flexGrow: 1, flexShrink: 1, gap: 2 },
  title: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  inputs: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end', gap: space.sm, flexGrow: 1 },
  input: { width: 150 },
  buttons: { flexDirection: 'row', gap: space.xs, paddingBottom: 2 },
});
