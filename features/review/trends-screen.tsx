import { useLocalSearchParams, useRouter } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { CautionNote } from '@/ui/caution-note';
import { ScreenFrame } from '@/ui/screen-frame';
import { ErrorState, LoadingState } from '@/ui/state-views';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import { useTrendsQuery } from './api';
import { useLayout } from '@/ui/use-layout';
import type { Site } from '@/shared/protocol';
import { backTarget } from './back-target';
import { formatValue, rangeWords } from './measurements-table';
import { MurmurByVisit } from './murmur-by-visit';
import { TrendChart } from './trend-chart';

export function TrendsScreen() {
  const { clientId, from } = useLocalSearchParams<{ clientId: string; from?: string }>();
  const trends = useTrendsQuery(clientId);
  const [site, setSite] = useState<Site>('mitral');
  const { isWide } = useLayout();
  const router = useRouter();
  const back = backTarget(from, String(clientId), 'client');
  const backButton = (
    <View style={styles.back}>
      <Button
        label={back.label}
        variant="ghost"
        onPress={() => router.navigate(back.href)}
        testID="trends-back"
      />
    </View>
  );
  if (trends.isPending) return <LoadingState label="Loading trends…" testID="trends-loading" />;
  if (trends.isError)
    return (
      <ScreenFrame title="Trends" testID="trends-screen" header={backButton}>
        <ErrorState
          message={trends.error.message}
          onRetry={() => void trends.refetch()}
          testID="trends-error"
        />
      </ScreenFrame>
    );
  const { client, series, murmurScreens } = trends.data;
  const shown = series.filter((s) => s.site === site && s.points.some((p) => p.value !== null));
  return (
    <ScreenFrame
      title={`Trends: ${client.firstName} ${client.lastName}`}
      subtitle="Each measurement across visits; the green band is the clinic's range."
      testID="trends-screen"
      header={backButton}
    >
      <CautionNote compact />
      <View style={styles.tabs}>
        {sites.map((s) => (
          <Pressable
            key={s.id}
            onPress={() => setSite(s.id)}
            style={[styles.chip, site === s.id && styles.chipOn]}
            testID={`trends-site-${s.id}`}
            accessibilityRole="button"
          >
            <AppText variant="small" color={site === s.id ? colors.textOnInk : colors.ink}>
              {s.label}
            </AppText>
          </Pressable>
        ))}
      </View>
      <MurmurByVisit screens={murmurScreens.filter((m) => m.site === site)} />
      <View style={[styles.grid, isWide && styles.gridWide]}>
        {shown.map((s) => {
          const outCount = s.points.filter((p) => p.status === 'above' || p.status === 'below').length;
          const last = [...s.points].reverse().find((p) => p.value !== null);
          return (
            <View
              key={s.key}
              style={[styles.card, isWide && styles.cardWide]}
              testID={`trend-${s.site}-${s.key}`}
            >
              <AppText variant="smallStrong" color={colors.ink}>
                {s.label}
                {s.unit ? ` (${s.unit})` : ''}
              </AppText>
              <TrendChart series={s} testID={`trend-chart-${s.site}-${s.key}`} />
              <AppText variant="caption" color={colors.textMuted} testID={`trend-range-${s.site}-${s.key}`}>
                Latest {formatValue(last?.value ?? null, s.unit)} · clinic's range {rangeWords(s.range)}
                {s.range ? ` (${s.range.source})` : ''}
              </AppText>
              {outCount ? (
                <AppText variant="caption" color={colors.caution}>
                  ⚠ {outCount} visit{outCount === 1 ? '' : 's'} outside the clinic&apos;s range: open the
                  visit for its reading
                </AppText>
              ) : null}
            </View>
          );
        })}
      </View>
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  back: { alignItems: 'flex-start', marginTop: space.xs },
  tabs: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  chip: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.pill,
    paddingHorizontal: space.md,
    paddingVertical: 6,
    backgroundColor: colors.surface,
  },
  chipOn: { backgroundColor: colors.ink, borderColor: colors.ink },
  grid: { gap: space.md },
  gridWide: { flexDirection: 'row', flexWrap: 'wrap' },
  card: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    gap: space.xs,
  },
  cardWide: { width: '32%', flexGrow: 1, flexBasis: 320 },
});
