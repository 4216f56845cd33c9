import { Link } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, TextInput, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { CautionNote } from '@/ui/caution-note';
import { ClippedText } from '@/ui/clipped-text';
import { formatDate, formatTime } from '@/ui/format';
import { ScreenFrame } from '@/ui/screen-frame';
import { EmptyState, ErrorState, LoadingState } from '@/ui/state-views';
import { referToClinician } from '@/shared/cautions';
import { colors, fonts, radii, space } from '@/ui/theme';
import { useReviewSessionsQuery, type SessionFilters } from './sessions-api';
import { useDebouncedValue } from '@/ui/use-debounced-value';
import { useLayout } from '@/ui/use-layout';
import { verdictWords } from '@/ui/verdicts';
import type { QualityVerdict, SessionStatus } from '@/shared/protocol';
import type { ReviewSessionRow, ReviewSort } from '@/shared/protocol/review';
import { statusLabels } from './session-labels';
import { SiteChips } from './site-chips';

const PAGE = 25;
const dateOk = (v: string) => v === '' || /^\d{4}-\d{2}-\d{2}$/.test(v);

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

function SortHeader({
  label,
  sort,
  current,
  dir,
  onSort,
  flex,
}: {
  label: string;
  sort: ReviewSort | null;
  current: ReviewSort;
  dir: 'asc' | 'desc';
  onSort: (s: ReviewSort) => void;
  flex: number;
}) {
  const active = sort !== null && sort === current;
  const content = (
    <AppText variant="caption" color={active ? colors.ink : colors.textMuted}>
      {label.toUpperCase()}
      {active ? (dir === 'asc' ? ' ▲' : ' ▼') : ''}
    </AppText>
  );
  if (!sort) return <View style={{ flex }}>{content}</View>;
  return (
    <Pressable
      style={{ flex }}
      onPress={() => onSort(sort)}
      testID={`sort-${sort}`}
      accessibilityRole="button"
      accessibilityLabel={`Sort by ${label}`}
    >
      {content}
    </Pressable>
  );
}

/** The practitioner's table of synced sessions: server-paged, sorted and filtered. */
export function ReviewSessionsScreen({ testID = 'review-sessions' }: { testID?: string }) {
  const { isWide } = useLayout();
  const [search, setSearch] = useState('');
  const [showFilters, setShowFilters] = useState(false);
  const q = useDebouncedValue(search.trim(), 300);
  const [status, setStatus] = useState<SessionStatus | undefined>();
  const [flagged, setFlagged] = useState<'true' | 'false' | undefined>();
  const [quality, setQuality] = useState<QualityVerdict | undefined>();
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [client, setClient] = useState<{ id: string; name: string } | null>(null);
  const [operator, setOperator] = useState<{ id: string; name: string } | null>(null);
  const [sort, setSort] = useState<ReviewSort>('startedAt');
  const [dir, setDir] = useState<'asc' | 'desc'>('desc');
  const [cursors, setCursors] = useState<(string | null)[]>([null]);
  const filters: SessionFilters = {
    q: q || undefined,
    status,
    flagged: flagged as SessionFilters['flagged'],
    quality,
    from: dateOk(from) && from ? from : undefined,
    to: dateOk(to) && to ? to : undefined,
    clientId: client?.id,
    operatorId: operator?.id,
    sort,
    dir,
  };
  const filterKey = JSON.stringify(filters);
  const [lastKey, setLastKey] = useState(filterKey);
  if (lastKey !== filterKey) {
    setLastKey(filterKey);
    setCursors([null]);
  }
  const cursor = cursors[cursors.length - 1];
  const page = useReviewSessionsQuery(filters, lastKey === filterKey ? cursor : null, PAGE);
  const onSort = (s: ReviewSort) => {
    if (s === sort) setDir(dir === 'asc' ? 'desc' : 'asc');
    else {
      setSort(s);
      setDir(s === 'startedAt' ? 'desc' : 'asc');
    }
  };
  const first = (cursors.length - 1) * PAGE + 1;

  const active = [status, flagged, quality, from, to, client, operator].filter(Boolean).length;
  const filtersBar = (
    <View style={styles.filters} testID="session-filters">
      <View style={[styles.inputs, isWide && styles.inputsWide]}>
        <TextInput
          value={search}
          onChangeText={setSearch}
          placeholder="Search client name"
          placeholderTextColor={colors.textMuted}
          style={[styles.input, styles.search]}
          testID="filter-search"
          accessibilityLabel="Search client name"
        />
        {!isWide ? (
          <Button
            label={showFilters ? 'Hide filters' : `Filters${active ? ` (${active} on)` : ''}`}
            variant="secondary"
            testID="filters-toggle"
            onPress={() => setShowFilters(!showFilters)}
          />
        ) : null}
      </View>
      {isWide || showFilters ? (
        <>
          <View style={[styles.inputs, isWide && styles.inputsWide]}>
            <TextInput
              value={from}
              onChangeText={setFrom}
              placeholder="From YYYY-MM-DD"
              placeholderTextColor={colors.textMuted}
              style={[styles.input, !dateOk(from) && styles.bad]}
              testID="filter-from"
              accessibilityLabel="From date"
            />
            <TextInput
              value={to}
              onChangeText={setTo}
              placeholder="To YYYY-MM-DD"
              placeholderTextColor={colors.textMuted}
              style={[styles.input, !dateOk(to) && styles.bad]}
              testID="filter-to"
              accessibilityLabel="To date"
            />
          </View>
          <View style={styles.chips}>
            {(['completed', 'reviewed', 'in_progress', 'cancelled'] as const).map((s) => (
              <Chip
                key={s}
                label={statusLabels[s].label}
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
              Dates are written YYYY-MM-DD, for example 2026-11-30.
            </AppText>
          ) : null}
        </>
      ) : null}
    </View>
  );

  let body;
  if (page.isPending) body = <LoadingState label="Loading sessions…" testID="sessions-loading" />;
  else if (page.isError)
    body = (
      <ErrorState message={page.error.message} onRetry={() => void page.refetch()} testID="sessions-error" />
    );
  else if (page.data.sessions.length === 0)
    body = (
      <EmptyState
        title="No sessions match"
        detail="Change or clear the filters; new sessions appear once a device has synced them."
        testID="sessions-empty"
      />
    );
  else {
    const rows = page.data.sessions;
    body = (
      <>
        {isWide ? (
          <View style={styles.table} testID="sessions-table">
            <View style={[styles.row, styles.head]}>
              <SortHeader
                label="Client"
                sort="clientName"
                current={sort}
                dir={dir}
                onSort={onSort}
                flex={2}
              />
              <SortHeader
                label="Recorded"
                sort="startedAt"
                current={sort}
                dir={dir}
                onSort={onSort}
                flex={1.4}
              />
              <SortHeader
                label="Operator"
                sort="operatorName"
                current={sort}
                dir={dir}
                onSort={onSort}
                flex={1.3}
              />
              <SortHeader
                label="Sites (quality)"
                sort={null}
                current={sort}
                dir={dir}
                onSort={onSort}
                flex={1.6}
              />
              <SortHeader label="Status" sort="status" current={sort} dir={dir} onSort={onSort} flex={1.2} />
              <SortHeader label="Referral" sort={null} current={sort} dir={dir} onSort={onSort} flex={1.5} />
            </View>
            {rows.map((s, i) => (
              <Row key={s.id} s={s} striped={i % 2 === 1} onClient={setClient} onOperator={setOperator} />
            ))}
          </View>
        ) : (
          <View style={styles.cards} testID="sessions-table">
            {rows.map((s) => (
              <Link key={s.id} href={`/sessions/${s.id}`} testID={`session-row-${s.id}`} style={styles.card}>
                <View style={styles.cardInner}>
                  <ClippedText text={s.clientName} lines={2} variant="bodyStrong" color={colors.ink} />
                  <AppText variant="number" color={colors.textMuted}>
                    {formatDate(s.startedAt)} {formatTime(s.startedAt)} · {s.operatorName ?? '—'}
                  </AppText>
                  <SiteChips verdicts={s.sites} testID={`review-sites-${s.id}`} />
                  <View style={styles.chips}>
                    <Badge label={statusLabels[s.status].label} tone={statusLabels[s.status].tone} />
                    {s.flagged ? <Badge label={`Flagged: ${referToClinician}`} tone="danger" /> : null}
                  </View>
                </View>
              </Link>
            ))}
          </View>
        )}
        <View style={styles.pager}>
          <AppText variant="small" color={colors.textMuted} testID="sessions-range">
            {first}–{first + rows.length - 1} of {page.data.total}
          </AppText>
          <Button
            label="Previous"
            variant="secondary"
            testID="page-previous"
            disabled={cursors.length <= 1}
            onPress={() => setCursors(cursors.slice(0, -1))}
          />
          <Button
            label="Next"
            variant="secondary"
            testID="page-next"
            disabled={!page.data.nextCursor}
            onPress={() => page.data.nextCursor && setCursors([...cursors, page.data.nextCursor])}
          />
          {page.isFetching ? (
            <AppText variant="caption" color={colors.textMuted}>
              updating…
            </AppText>
          ) : null}
        </View>
      </>
    );
  }

  return (
    <ScreenFrame
      title="Sessions"
      subtitle="Synced sessions from the clinic's devices. Open one to review it."
      testID={testID}
      header={filtersBar}
    >
      <CautionNote compact />
      {body}
    </ScreenFrame>
  );
}

function Row({
  s,
  striped,
  onClient,
  onOperator,
}: {
  s: ReviewSessionRow;
  striped: boolean;
  onClient: (c: { id: string; name: string }) => void;
  onOperator: (o: { id: string; name: string }) => void;
}) {
  const status = statusLabels[s.status];
  return (
    <View style={[styles.row, striped && styles.striped]} testID={`session-row-${s.id}`}>
      <View style={[styles.cell, { flex: 2 }]} testID={`session-client-cell-${s.id}`}>
        <Link href={`/sessions/${s.id}`} asChild>
          <Pressable testID={`open-session-${s.id}`} style={styles.nameLink}>
            <ClippedText text={s.clientName} variant="smallStrong" color={colors.accent} />
          </Pressable>
        </Link>
        <Pressable
          onPress={() => onClient({ id: s.clientId, name: s.clientName })}
          testID={`only-client-${s.id}`}
          accessibilityLabel={`Only ${s.clientName}`}
        >
          <AppText variant="caption" color={colors.textMuted}>
            only this client
          </AppText>
        </Pressable>
      </View>
      <AppText variant="number" color={colors.text} style={[styles.cell, { flex: 1.4 }]}>
        {formatDate(s.startedAt)} {formatTime(s.startedAt)}
      </AppText>
      <Pressable
        style={[styles.cell, { flex: 1.3 }]}
        disabled={!s.operatorId}
        onPress={() => s.operatorId && onOperator({ id: s.operatorId, name: s.operatorName ?? '' })}
        accessibilityLabel="Only this operator"
        testID={`only-operator-${s.id}`}
      >
        <ClippedText text={s.operatorName ?? '—'} />
      </Pressable>
      <View style={[styles.cell, { flex: 1.6 }]}>
        <SiteChips verdicts={s.sites} testID={`review-sites-${s.id}`} />
      </View>
      <View style={[styles.cell, { flex: 1.2 }]}>
        <Badge label={status.label} tone={status.tone} />
      </View>
      <View style={[styles.cell, { flex: 1.5 }]}>
        {s.flagged ? (
          <Badge label={`⚠ ${referToClinician}`} tone="danger" testID={`flagged-${s.id}`} />
        ) : (
          <AppText variant="small" color={colors.textMuted}>
            none
          </AppText>
        )}
      </View>
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
  bad: { borderColor: colors.danger },
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
  table: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    overflow: 'hidden',
  },
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
  },
  head: { backgroundColor: colors.surfaceMuted },
  striped: { backgroundColor: '#FBF9F4' },
  // A cell never grows past its share of the row, so a long name cannot cover (or take the clicks of) the next.
  cell: { gap: 2, minWidth: 0, overflow: 'hidden' },
  nameLink: { alignSelf: 'flex-start', maxWidth: '100%' },
  cards: { gap: space.sm },
  card: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
  },
  cardInner: { gap: space.xs },
  pager: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
