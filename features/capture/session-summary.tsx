import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Badge } from '@/ui/badge';
import { sites } from '@/shared/sites';
import { verdictWords } from '@/ui/verdicts';
import { colors, space } from '@/ui/theme';
import type { SiteRecording } from '@/device/local-store/records';
import { TraceView } from './trace-view';

/** Each site's outcome, with a small trace where there is one. */
export function SessionSummary({
  recordings,
  traceWidth,
}: {
  recordings: SiteRecording[];
  traceWidth: number;
}) {
  return (
    <View style={styles.list} testID="session-summary">
      {sites.map((site) => {
        const r = recordings.find((x) => x.site === site.id);
        return (
          <Card key={site.id} style={styles.row} testID={`summary-${site.id}`}>
            <View style={styles.head}>
              <AppText variant="bodyStrong" color={colors.ink}>
                {site.label}
              </AppText>
              {!r ? (
                <Badge label="Not recorded" tone="neutral" />
              ) : r.outcome === 'skipped' ? (
                <Badge label="Skipped" tone="neutral" testID={`summary-${site.id}-skipped`} />
              ) : (
                <Badge
                  label={r.verdict ? verdictWords[r.verdict].label : 'Recorded'}
                  tone={r.verdict ? verdictWords[r.verdict].tone : 'neutral'}
                  testID={`summary-${site.id}-verdict`}
                />
              )}
            </View>
            {r?.outcome === 'recorded' ? (
              <>
                <AppText variant="number" color={colors.text} testID={`summary-${site.id}-rate`}>
                  {r.heartRateBpm === null ? '— bpm' : `${Math.round(r.heartRateBpm)} bpm`} ·{' '}
                  {r.durationS?.toFixed(1)} s · {r.source === 'import' ? 'imported' : 'recorded'}
                  {r.blobHash ? ' · sealed' : ''}
                </AppText>
                {r.trace && r.analysis ? (
                  <TraceView
                    trace={r.trace}
                    sounds={r.analysis.sounds}
                    width={traceWidth}
                    height={70}
                    testID={`summary-${site.id}-trace`}
                  />
                ) : null}
                {r.note ? (
                  <AppText variant="caption" color={colors.textMuted}>
                    Note: {r.note}
                  </AppText>
                ) : null}
              </>
            ) : null}
            {r?.outcome === 'skipped' ? (
              <AppText variant="caption" color={colors.textMuted}>
                Reason: {r.skipReason}
              </AppText>
            ) : null}
          </Card>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  row: { padding: space.md, gap: space.xs },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center' },
});
