import { useState } from 'react';
import { Pressable, StyleSheet, TextInput, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { verdictWords } from '@/ui/verdicts';
import { DateField } from '@/ui/date-field';
import { Button } from '@/ui/button';
import { colors, fonts, radii, space } from '@/ui/theme';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import type { QualityVerdict, SessionStatus } from '@/shared/protocol';
import type { SessionFilters } from './api';
import { visitStatusWords } from '@/ui/status-words';

const dateOk = (v: string) => v === '' || /^\d{4}-\d{2}-\d{2}$/.test(v);

type Named = { id: string; name: string };

/** What the practitioner narrowed the session table to; `filters` is what the server is asked for. */
export function useSessionFilters() {
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search.trim(), 300);
  const [status, setStatus] = useState<SessionStatus | undefined>();
  const [flagged, setFlagged] = useState<'true' | 'false' | undefined>();
  const [quality, setQuality] = useState<QualityVerdict | undefined>();
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [client, setClient] = useState<Named | null>(null);
  const [operator, setOperator] = useState<Named | null>(null);
  const filters: Omit<SessionFilters, 'sort' | 'dir'> = {
    q: q || undefined,
    status,
    flagged: flagged as SessionFilters['flagged'],
    quality,
    from: dateOk(from) && from ? from : undefined,
    to: dateOk(to) && to ? to : undefined,
    clientId: client?.id,
    operatorId: operator?.id,
  };
  const activeCount = [status, flagged, quality, from, to, client, operator].filter(Boolean).length;
  return {
    filters,
    activeCount,
    values: { search, status, flagged, quality, from, to, client, operator },
    set: { setSearch, setStatus, setFlagged, setQuality, setFrom, setTo, setClient, setOperator },
  };
}

export type SessionFilterState = ReturnType<typeof useSessionFilters>;

function Chip({
  label,
  on,
  onPress,
  testID,
}: {
  label: string;
  on: boolean;
  onPress: () => void;
  testID: string;
}) {
  return (
    <Pressable
      onPress={onPress}
      style={[styles.chip, on && styles.chipOn]}
      testID={testID}
      accessibilityRole="button"
      accessibilityState={{ selected: on }}
    >
      <AppText variant="small" color={on ? colors.textOnInk : colors.ink}>
        {label}
      </AppText>
    </Pressable>
  );
}

/** The search and filters above the session table; on phones all but the search fold away. */
export function SessionFiltersBar({ state, wide }: { state: SessionFilterState; wide: boolean }) {
  const [showFilters, setShowFilters] = useState(false);
  const { search, status, flagged, quality, from, to, client, operator } = state.values;
  const { setSearch, setStatus, setFlagged, setQuality, setFrom, setTo, setClient, setOperator } = state.set;
  const active = state.activeCount;
  return (
    <View style={styles.filters} testID="session-filters">
      <View style={[styles.inputs, wide && styles.inputsWide]}>
        <TextInput
          value={search}
          onChangeText={setSearch}
          placeholder="Search client name"
          placeholderTextColor={colors.textMuted}
          style={[styles.input, styles.search]}
          testID="filter-search"
          accessibilityLabel="Search client name"
        />
        {!wide ? (
          <Button
            label={showFilters ? 'Hide filters' : `Filters${active ? ` (${active} on)` : ''}`}
            variant="secondary"
            testID="filters-toggle"
            onPress={() => setShowFilters(!showFilters)}
          />
        ) : null}
      </View>
      {wide || showFilters ? (
        <>
          <View style={[styles.inputs, wide && styles.inputsWide]}>
            <View style={wide ? styles.dateFieldWide : null}>
              <DateField label="From" testID="filter-from" value={from} onChange={setFrom} />
            </View>
            <View style={wide ? styles.dateFieldWide : null}>
              <DateField label="To" testID="filter-to" value={to} onChange={setTo} min={from || undefined} />
            </View>
          </View>
          <View style={styles.chips}>
            {(['completed', 'reviewed', 'in_progress', 'cancelled'] as const).map((s) => (
              <Chip
                key={s}
                label={visitStatusWords[s].label}
                on={status === s}
                onPress={() => setStatus(status === s ? undefined : s)}
                testID={`filter-status-${s}`}
              />
            ))}
          </View>
          <View style={styles.chips}>
            <Chip
              label="Flagged for referral"
              on={flagged === 'true'}
              onPress={() => setFlagged(flagged === 'true' ? undefined : 'true')}
              testID="filter-flagged"
            />
            <Chip
              label="Not flagged"
              on={flagged === 'false'}
              onPress={() => setFlagged(flagged === 'false' ? undefined : 'false')}
              testID="filter-not-flagged"
            />
            {(['good', 'usable', 'retake'] as const).map((v) => (
              <Chip
                key={v}
                label={`Worst recording: ${verdictWords[v].label}`}
                on={quality === v}
                onPress={() => setQuality(quality === v ? undefined : v)}
                testID={`filter-quality-${v}`}
              />
            ))}
            {client ? (
              <Chip
                label={`Client: ${client.name} ✕`}
                on
                onPress={() => setClient(null)}
                testID="filter-client"
              />
            ) : null}
            {operator ? (
              <Chip
                label={`Operator: ${operator.name} ✕`}
                on
                onPress={() => setOperator(null)}
                testID="filter-operator"
              />
            ) : null}
          </View>
          {!dateOk(from) || !dateOk(to) ? (
            <AppText variant="small" color={colors.danger}>
              Choose the days on the calendar, or type them as YYYY-MM-DD.
            </AppText>
          ) : null}
        </>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  filters: { gap: space.sm, marginTop: space.sm },
  input: {
    minHeight: 40,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    backgroundColor: colors.surface,
    paddingHorizontal: space.md,
    fontFamily: fonts.body,
    fontSize: 14,
    color: colors.text,
  },
  search: { flexGrow: 1, minWidth: 240 },
  inputs: { gap: space.sm },
  inputsWide: { flexDirection: 'row' },
  // Beside the search on wide screens; stacked under it on phones (a basis there would be a height).
  dateFieldWide: { flexGrow: 1, flexBasis: 220 },
  chips: { flexDirection: 'row', gap: space.xs, flexWrap: 'wrap', alignItems: 'center' },
  chip: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.pill,
    paddingHorizontal: space.md,
    paddingVertical: 5,
    backgroundColor: colors.surface,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
});
