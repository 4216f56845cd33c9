import { Link, useLocalSearchParams } from 'expo-router';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { CautionNote } from '@/ui/caution-note';
import { displayTimeZone, formatDate, formatDateTime } from '@/ui/format';
import { calendarDateIn } from '@/shared/format/dates';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { colors, radii, space } from '@/ui/theme';
import { useAuth } from '@/features/auth/auth-context';
import { prefetchTraces, useComparisonQuery, useEarlierVisitsQuery, useSessionDetailQuery } from './api';
import { useLayout } from '@/ui/use-layout';
import { usePlayback } from './clip-playback';
import { ComparisonTable } from './comparison-table';
import { sourceNumbers } from './measurements-table';
import { ReferralPanel } from './referral-panel';
import { SiteSummaryStrip } from './site-summary-strip';
import { NotesForm } from './notes-form';
import { ReportPanel } from './report-panel';
import { SiteCard } from './site-card';

export function SessionViewScreen() {
  const { sessionId } = useLocalSearchParams<{ sessionId: string }>();
  const queryClient = useQueryClient();
  // The traces load beside the session itself rather than after it: the first trace shows one round trip sooner.
  useEffect(() => prefetchTraces(queryClient, sessionId), [queryClient, sessionId]);
  const detail = useSessionDetailQuery(sessionId);
  const earlier = useEarlierVisitsQuery(sessionId);
  const [compareWith, setCompareWith] = useState<string | null>(null);
  const [mode, setMode] = useState<'beside' | 'over'>('beside');
  const comparison = useComparisonQuery(sessionId, compareWith);
  const playback = usePlayback();
  const { isWide } = useLayout();
  const auth = useAuth();

  const compareFor = useMemo(() => {
    return (site: string) => {
      if (!compareWith || !comparison.data) return null;
      const f = comparison.data.firstS1.find((x) => x.site === site);
      const shiftS = f && f.now !== null && f.then !== null ? f.now - f.then : 0;
      return {
        sessionId: compareWith,
        mode,
        shiftS,
        label: `Visit of ${formatDate(comparison.data.then.startedAt)}`,
      };
    };
  }, [compareWith, comparison.data, mode]);

  if (detail.isPending) return <LoadingState label="Loading session…" testID="session-loading" />;
  if (detail.isError)
    return (
      <ErrorState
        message={detail.error.message}
        onRetry={() => void detail.refetch()}
        testID="session-error"
      />
    );
  const s = detail.data;
  const clientName = `${s.client.firstName} ${s.client.lastName}`;
  const date = calendarDateIn(s.startedAt, displayTimeZone());
  const fileName = `fourpoint-report-${clientName.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${date}.pdf`;
  const sources = sourceNumbers(s.sites.flatMap((site) => site.measurements));
  const canEdit = auth.user?.role === 'practitioner';
  // Two visits side by side need a whole row per site; otherwise the sites sit two to a row on a wide screen.
  const twoColumns = isWide && !(compareWith && mode === 'beside');

  return (
    <ScreenFrame
      title={clientName}
      subtitle={`Visit of ${formatDateTime(s.startedAt)} · recorded by ${s.operatorName ?? '—'} · ${s.clinicName}`}
      testID="session-view"
    >
      <CautionNote compact />
      <SiteSummaryStrip sites={s.sites} />
      <ReferralPanel sessionId={sessionId} referral={s.referral} canEdit={canEdit} />
      <View style={styles.toolbar}>
        <AppText variant="smallStrong" color={colors.ink}>
          Compare with:
        </AppText>
        {(earlier.data ?? []).length === 0 ? (
          <AppText variant="small" color={colors.textMuted}>
            {earlier.isPending ? 'loading earlier visits…' : 'no earlier visit'}
          </AppText>
        ) : null}
        {(earlier.data ?? []).map((v) => (
          <Pressable
            key={v.id}
            onPress={() => setCompareWith(compareWith === v.id ? null : v.id)}
            style={[styles.chip, compareWith === v.id && styles.chipOn]}
            testID={`compare-visit-${v.id}`}
            accessibilityRole="button"
            accessibilityState={{ selected: compareWith === v.id }}
          >
            <AppText variant="small" color={compareWith === v.id ? colors.textOnInk : colors.ink}>
              {formatDate(v.startedAt)}
            </AppText>
          </Pressable>
        ))}
        {compareWith ? (
          <>
            {(['beside', 'over'] as const).map((m) => (
              <Pressable
                key={m}
                onPress={() => setMode(m)}
                style={[styles.chip, mode === m && styles.chipOn]}
                testID={`compare-mode-${m}`}
                accessibilityRole="button"
              >
                <AppText variant="small" color={mode === m ? colors.textOnInk : colors.ink}>
                  {m === 'beside' ? 'Beside' : 'Overlaid'}
                </AppText>
              </Pressable>
            ))}
          </>
        ) : null}
        <View style={styles.links}>
          <Link
            href={{
              pathname: '/review-clients/[clientId]',
              params: { clientId: s.client.id, from: `session:${sessionId}` },
            }}
            testID="open-client"
          >
            <AppText variant="smallStrong" color={colors.accent}>
              All visits of this client →
            </AppText>
          </Link>
          <Link
            href={{
              pathname: '/review-clients/[clientId]/trends',
              params: { clientId: s.client.id, from: `session:${sessionId}` },
            }}
            testID="open-trends"
          >
            <AppText variant="smallStrong" color={colors.accent}>
              Trends across visits →
            </AppText>
          </Link>
        </View>
      </View>
      <View style={[styles.grid, twoColumns && styles.gridWide]} testID="site-grid">
        {s.sites.map((site) => (
          <View key={site.site} style={twoColumns ? styles.cellWide : styles.cell}>
            <SiteCard
              sessionId={sessionId}
              site={site}
              playback={playback}
              compare={compareFor(site.site)}
              sources={sources}
            />
          </View>
        ))}
      </View>
      {comparison.data ? <ComparisonTable comparison={comparison.data} /> : null}
      {sources.length ? (
        <View style={styles.sources} testID="sources-panel">
          <AppText variant="smallStrong" color={colors.ink}>
            Sources of the ranges
          </AppText>
          {sources.map((source, i) => (
            <AppText key={source} variant="caption" color={colors.textMuted} testID={`source-${i + 1}`}>
              [{i + 1}] {source}
            </AppText>
          ))}
        </View>
      ) : null}
      <NotesForm sessionId={sessionId} notes={s.notes} canEdit={canEdit} />
      <ReportPanel
        sessionId={sessionId}
        compareWith={compareWith}
        clientEmail={s.client.email}
        fileName={fileName}
        canSend={canEdit}
      />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  sources: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    gap: 2,
  },
  toolbar: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  chip: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.pill,
    paddingHorizontal: space.md,
    paddingVertical: 6,
    backgroundColor: colors.surface,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
  links: { marginLeft: 'auto', flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  grid: { gap: space.md },
  gridWide: { flexDirection: 'row', flexWrap: 'wrap' },
  cell: { width: '100%' },
  cellWide: { width: '49%', flexGrow: 1, flexBasis: 480 },
});
