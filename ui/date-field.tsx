import { useState } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { DayPicker } from 'react-day-picker';
import 'react-day-picker/style.css';
import { AppText } from './app-text';
import { Button } from './button';
import { formatDate } from './format';
import { TextField } from './text-field';
import { colors, radii, space } from './theme';

const CALENDAR_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** A calendar date as a Date at local noon, so no zone offset can move it to the day before or after. */
function toLocalNoon(ymd: string | undefined): Date | undefined {
  const match = ymd ? CALENDAR_DATE.exec(ymd) : null;
  if (!match) return undefined;
  const date = new Date(Number(match[1]), Number(match[2]) - 1, Number(match[3]), 12);
  return date.getDate() === Number(match[3]) ? date : undefined;
}

const toCalendarDate = (date: Date) =>
  `${date.getFullYear()}-${String(date.getMonth() + 1).padStart(2, '0')}-${String(date.getDate()).padStart(2, '0')}`;

type Props = {
  label: string;
  testID: string;
  /** YYYY-MM-DD, or '' for none. */
  value: string;
  onChange: (value: string) => void;
  onBlur?: () => void;
  error?: string;
  /** The first and last days that may be chosen (YYYY-MM-DD). */
  min?: string;
  max?: string;
  editable?: boolean;
  /** Month and year menus in the calendar header, for dates far from today (a date of birth). */
  farDates?: boolean;
};

/**
 * A date typed as YYYY-MM-DD or chosen on a calendar (react-day-picker on the web target). The chosen day is
 * repeated under the box in the reader's own format, so a typed date is confirmed in words.
 */
export function DateField({
  label,
  testID,
  value,
  onChange,
  onBlur,
  error,
  min,
  max,
  editable = true,
  farDates = false,
}: Props) {
  const [open, setOpen] = useState(false);
  const selected = toLocalNoon(value);
  const first = toLocalNoon(min);
  const last = toLocalNoon(max);
  const disabled = [...(first ? [{ before: first }] : []), ...(last ? [{ after: last }] : [])];

  return (
    <View style={styles.wrap}>
      <View style={styles.row}>
        <View style={styles.input}>
          <TextField
            label={label}
            testID={testID}
            value={value}
            onChangeText={onChange}
            onBlur={onBlur}
            error={error}
            placeholder="YYYY-MM-DD"
            inputMode="numeric"
            editable={editable}
          />
        </View>
        {Platform.OS === 'web' && editable ? (
          <Button
            label={open ? 'Close calendar' : 'Calendar'}
            variant="secondary"
            testID={`${testID}-calendar-toggle`}
            onPress={() => setOpen((now) => !now)}
          />
        ) : null}
      </View>
      {selected && !error ? (
        <AppText variant="small" color={colors.textMuted} testID={`${testID}-in-words`}>
          {formatDate(value)}
        </AppText>
      ) : null}
      {open && Platform.OS === 'web' ? (
        <View style={styles.calendar} testID={`${testID}-calendar`}>
          <DayPicker
            mode="single"
            selected={selected}
            defaultMonth={selected ?? first ?? last}
            onSelect={(day) => {
              if (!day) return;
              onChange(toCalendarDate(day));
              setOpen(false);
            }}
            disabled={disabled}
            startMonth={farDates ? new Date(1900, 0) : first}
            endMonth={last ?? (farDates ? new Date() : undefined)}
            captionLayout={farDates ? 'dropdown' : 'label'}
          />
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'flex-end', gap: space.sm, flexWrap: 'wrap' },
  input: { flexGrow: 1, flexBasis: 180 },
  calendar: {
    alignSelf: 'flex-start',
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    backgroundColor: colors.surface,
    padding: space.sm,
  },
});
