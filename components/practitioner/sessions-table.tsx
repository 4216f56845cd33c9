import { StyleSheet, View } from 'react-native';
import { AppText } from '@/components/ui/app-text';
import { Badge } from '@/components/ui/badge';
import { formatDate, formatTime } from '@/components/ui/format';
import { colors, radii, space } from '@/constants/theme';
import type { SessionSummary } from '@/shared/protocol';
import { statusLabels } from './session-labels';
import { SiteChips } from './site-chips';

const columns = [
  { key: 'client', label: 'Client', flex: 2 },
  { key: 'started', label: 'Recorded', flex: 1.4 },
  { key: 'operator', label: 'Operator', flex: 1.4 },
  { key: 'sites', label: 'Sites (quality)', flex: 1.6 },
  { key: 'status', label: 'Status', flex: 1.3 },
  { key: 'followUp', label: 'Follow-up', flex: 1.1 },
] as const;

export function SessionsTable({ sessions }: { sessions: SessionSummary[] }) {
  return (
    <View style={styles.table} testID="sessions-table" accessibilityRole="list">
      <View style={[styles.row, styles.head]}>
        {columns.map((c) => (
          <View key={c.key} style={{ flex: c.flex }}>
            <AppText variant="caption" color={colors.textMuted}>
              {c.label.toUpperCase()}
            </AppText>
          </View>
        ))}
      </View>
      {sessions.map((s, i) => {
        const status = statusLabels[s.status];
        return (
          <View key={s.id} style={[styles.row, i % 2 === 1 && styles.striped]} testID={`session-row-${s.id}`}>
            <View style={{ flex: columns[0].flex }}>
              <AppText variant="smallStrong" color={colors.ink} numberOfLines={1}>
                {s.clientName}
              </AppText>
            </View>
            <View style={{ flex: columns[1].flex }}>
              <AppText variant="number" color={colors.text}>
                {formatDate(s.startedAt)} {formatTime(s.startedAt)}
              </AppText>
            </View>
            <View style={{ flex: columns[2].flex }}>
              <AppText variant="small" color={colors.text} numberOfLines={1}>
                {s.operatorName ?? '—'}
              </AppText>
            </View>
            <View style={{ flex: columns[3].flex }}>
              <SiteChips verdicts={s.sites} testID={`session-sites-${s.id}`} />
            </View>
            <View style={{ flex: columns[4].flex }}>
              <Badge label={status.label} tone={status.tone} />
            </View>
            <View style={{ flex: columns[5].flex }}>
              <AppText variant="number" color={colors.text}>
                {formatDate(s.followUpDate)}
              </AppText>
            </View>
          </View>
        );
      })}
    </View>
  );
}

/** The same sessions as cards, for a narrow window. */
export function SessionsCards({ sessions }: { sessions: SessionSummary[] }) {
  return (
    <View style={styles.cards} testID="sessions-table">
      {sessions.map((s) => {
        const status = statusLabels[s.status];
        return (
          <View key={s.id} style={styles.card} testID={`session-row-${s.id}`}>
            <View style={styles.cardTop}>
              <AppText variant="bodyStrong" color={colors.ink} numberOfLines={1} style={styles.flex}>
                {s.clientName}
              </AppText>
              <Badge label={status.label} tone={status.tone} />
            </View>
            <AppText variant="number" color={colors.textMuted}>
              {formatDate(s.startedAt)} {formatTime(s.startedAt)} · {s.operatorName ?? '—'}
            </AppText>
            <SiteChips verdicts={s.sites} testID={`session-sites-${s.id}`} />
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
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
    paddingVertical: space.md,
  },
  head: { backgroundColor: colors.surfaceMuted, paddingVertical: space.sm },
  striped: { backgroundColor: '#FBF9F4' },
  cards: { gap: space.sm },
  card: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    gap: space.sm,
  },
  cardTop: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  flex: { flex: 1 },
});
