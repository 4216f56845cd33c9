import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { Card } from '@/ui/card';
import { ClippedText } from '@/ui/clipped-text';
import { DataTable, type Column } from '@/ui/data-table';
import { formatDateTime } from '@/ui/format';
import { colors, space } from '@/ui/theme';
import { referToClinician } from '@/shared/cautions';
import type { ReviewSessionRow, ReviewSort } from '@/shared/protocol/review';
import { visitStatusWords } from '@/ui/status-words';
import { SiteChips } from './site-chips';

type Named = { id: string; name: string };

type Props = {
  rows: readonly ReviewSessionRow[];
  wide: boolean;
  sort: { key: ReviewSort; dir: 'asc' | 'desc' };
  onSort: (key: ReviewSort) => void;
  /** Narrow the table to one client or one operator. */
  onClient: (client: Named) => void;
  onOperator: (operator: Named) => void;
};

function columns(onClient: Props['onClient'], onOperator: Props['onOperator']): Column<ReviewSessionRow>[] {
  return [
    {
      key: 'client',
      title: 'Client',
      flex: 2,
      sortKey: 'clientName',
      render: (s) => (
        <View style={styles.clientCell} testID={`session-client-cell-${s.id}`}>
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
      ),
    },
    {
      key: 'recorded',
      title: 'Recorded',
      flex: 1.4,
      sortKey: 'startedAt',
      render: (s) => (
        <AppText variant="number" color={colors.text}>
          {formatDateTime(s.startedAt)}
        </AppText>
      ),
    },
    {
      key: 'operator',
      title: 'Operator',
      flex: 1.3,
      sortKey: 'operatorName',
      render: (s) => (
        <Pressable
          disabled={!s.operatorId}
          onPress={() => s.operatorId && onOperator({ id: s.operatorId, name: s.operatorName ?? '' })}
          accessibilityLabel="Only this operator"
          testID={`only-operator-${s.id}`}
        >
          <ClippedText text={s.operatorName ?? '—'} />
        </Pressable>
      ),
    },
    {
      key: 'sites',
      title: 'Sites (quality)',
      flex: 1.6,
      render: (s) => <SiteChips verdicts={s.sites} testID={`review-sites-${s.id}`} />,
    },
    {
      key: 'status',
      title: 'Status',
      flex: 1.2,
      sortKey: 'status',
      render: (s) => (
        <Badge label={visitStatusWords[s.status].label} tone={visitStatusWords[s.status].tone} />
      ),
    },
    {
      key: 'referral',
      title: 'Referral',
      flex: 1.5,
      render: (s) =>
        s.flagged ? (
          <Badge label={`⚠ ${referToClinician}`} tone="danger" testID={`flagged-${s.id}`} />
        ) : (
          <AppText variant="small" color={colors.textMuted}>
            none
          </AppText>
        ),
    },
  ];
}

/** The synced sessions: a sortable table on wide screens, one card per session (a link to it) on phones. */
export function SessionsTable({ rows, wide, sort, onSort, onClient, onOperator }: Props) {
  if (wide) {
    return (
      <DataTable
        rows={rows}
        columns={columns(onClient, onOperator)}
        rowKey={(s) => s.id}
        wide
        testID="sessions-table"
        rowTestID={(s) => `session-row-${s.id}`}
        sort={sort}
        onSort={(key) => onSort(key as ReviewSort)}
      />
    );
  }
  return (
    <View style={styles.cards} testID="sessions-table">
      {rows.map((s) => (
        <Link key={s.id} href={`/sessions/${s.id}`} testID={`session-row-${s.id}`}>
          <Card style={styles.card}>
            <ClippedText text={s.clientName} lines={2} variant="bodyStrong" color={colors.ink} />
            <AppText variant="number" color={colors.textMuted}>
              {formatDateTime(s.startedAt)} · {s.operatorName ?? '—'}
            </AppText>
            <SiteChips verdicts={s.sites} testID={`review-sites-${s.id}`} />
            <View style={styles.badges}>
              <Badge label={visitStatusWords[s.status].label} tone={visitStatusWords[s.status].tone} />
              {s.flagged ? <Badge label={`Flagged: ${referToClinician}`} tone="danger" /> : null}
            </View>
          </Card>
        </Link>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  // A cell never grows past its share of the row, so a long name cannot cover (or take the clicks of) the next.
  clientCell: { gap: 2, minWidth: 0, overflow: 'hidden' },
  nameLink: { alignSelf: 'flex-start', maxWidth: '100%' },
  cards: { gap: space.sm },
  card: { width: '100%', padding: space.md, gap: space.xs },
  badges: { flexDirection: 'row', gap: space.xs, flexWrap: 'wrap', alignItems: 'center' },
});
