import { useEffect, useState } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Card } from '@/ui/card';
import { Badge } from '@/ui/badge';
import { Button } from '@/ui/button';
import { LoadingState } from '@/ui/state-views';
import { colors, space } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { referToClinician } from '@/shared/cautions';
import { siteInfo } from '@/shared/sites';
import { fetchClipUrl, useTraceQuery } from './api';
import type { ReviewSite } from '@/shared/protocol/review';
import type { Playback } from './clip-playback';
import { MeasurementsTable } from './measurements-table';
import { recordingWords } from './review-words';
import { clampWindow, panWindow, zoomWindow, type TimeWindow } from './time-window';
import { TraceGestures } from './trace-gestures';
import { TraceView } from './trace-view';

const isWeb = Platform.OS === 'web';

type Props = {
  sessionId: string;
  site: ReviewSite;
  playback: Playback;
  compare: { sessionId: string; mode: 'beside' | 'over'; shiftS: number; label: string } | null;
  sources: string[];
};

export function SiteCard(props: Props) {
  const { site } = props;
  // A skipped site is one line with its reason: nothing was recorded, so there is nothing to measure.
  if (site.skippedReason)
    return (
      <Card compact testID={`site-${site.site}`}>
        <AppText variant="bodyStrong" color={colors.ink} testID={`site-${site.site}-skipped`}>
          {siteInfo(site.site).label}: skipped. {site.skippedReason}
        </AppText>
      </Card>
    );
  return <RecordedSiteCard {...props} />;
}

function RecordedSiteCard({ sessionId, site, playback, compare, sources }: Props) {
  const info = siteInfo(site.site);
  const trace = useTraceQuery(site.hasAudio ? sessionId : null, site.site);
  const then = useTraceQuery(compare?.sessionId ?? null, site.site, Boolean(compare));
  const duration = trace.data?.durationS ?? site.durationS ?? 1;
  // A few seconds at first, so S1 and S2 read apart; zoom out shows the whole clip.
  const initial = Math.min(duration, 5);
  const [window, setWindow] = useState<TimeWindow>({ start: 0, end: initial });
  useEffect(() => setWindow({ start: 0, end: initial }), [initial]);
  const key = `${sessionId}/${site.site}`;
  const playing = playback.playingKey === key;
  const zoom = (factor: number) => setWindow(zoomWindow(window, factor, duration));
  const pan = (fraction: number) => setWindow(panWindow(window, fraction, duration));
  // While playing, the view follows the cursor when it leaves the zoomed window.
  useEffect(() => {
    if (!playing) return;
    const t = playback.positionS;
    if (t > window.end || t < window.start) {
      const span = window.end - window.start;
      setWindow(clampWindow({ start: t - span * 0.1, end: t + span * 0.9 }, duration));
    }
  }, [playing, playback.positionS, window, duration]);
  const tid = `site-${site.site}`;
  // "Beside" puts the two visits next to each other where there is room; on a phone the earlier one goes under.
  const { isWide } = useLayout();
  const beside = compare?.mode === 'beside' && Boolean(then.data);
  const besideWide = beside && isWide;

  return (
    <Card compact testID={tid}>
      <View style={styles.head}>
        <AppText variant="heading" color={colors.ink}>
          {info.label}
        </AppText>
        {site.qualityVerdict ? <Badge {...recordingWords(site.qualityVerdict)} /> : null}
        {site.heartRateBpm !== null ? (
          <AppText variant="number" color={colors.text}>
            {Math.round(site.heartRateBpm)} bpm
          </AppText>
        ) : null}
        {site.irregularRhythm ? (
          <Badge label={`Irregular rhythm: ${referToClinician}`} tone="danger" />
        ) : null}
      </View>
      {!site.hasAudio ? (
        <AppText variant="small" color={colors.textMuted} testID={`${tid}-no-clip`}>
          No clip on the server for this site.
        </AppText>
      ) : trace.isPending ? (
        <LoadingState label="Loading trace…" testID={`${tid}-trace-loading`} />
      ) : trace.isError ? (
        <AppText variant="small" color={colors.danger}>
          The trace could not be loaded: {trace.error.message}
        </AppText>
      ) : (
        <>
          <View style={besideWide && styles.besideRow} testID={`${tid}-traces`}>
            <View style={besideWide && styles.besideCell} testID={`${tid}-now`}>
              {beside ? (
                <AppText variant="caption" color={colors.textMuted}>
                  This visit
                </AppText>
              ) : null}
              <TraceGestures
                window={window}
                duration={duration}
                onChange={setWindow}
                testID={`${tid}-gestures`}
              >
                <TraceView
                  trace={trace.data}
                  window={window}
                  cursorS={playing ? playback.positionS : null}
                  overlay={
                    compare?.mode === 'over' && then.data
                      ? { trace: then.data, shiftS: compare.shiftS }
                      : null
                  }
                  testID={`${tid}-trace`}
                />
              </TraceGestures>
            </View>
            {beside && compare && then.data ? (
              <View style={besideWide && styles.besideCell} testID={`${tid}-then`}>
                <AppText variant="caption" color={colors.textMuted}>
                  {compare.label} (aligned on S1)
                </AppText>
                <TraceView
                  trace={{
                    ...then.data,
                    sounds: then.data.sounds.map((s) => ({
                      ...s,
                      startS: s.startS + compare.shiftS,
                      endS: s.endS + compare.shiftS,
                    })),
                  }}
                  window={window}
                  height={besideWide ? 150 : 90}
                  testID={`${tid}-then-trace`}
                  overlay={null}
                />
              </View>
            ) : null}
          </View>
          {compare?.mode === 'over' ? (
            <AppText variant="caption" color={colors.textMuted}>
              Blue: {compare.label}, aligned on S1
            </AppText>
          ) : null}
          <View style={styles.controls}>
            <Button
              label={playing ? 'Stop' : 'Play'}
              variant={playing ? 'primary' : 'secondary'}
              testID={`${tid}-play`}
              onPress={() =>
                playing ? playback.stop() : void playback.play(key, () => fetchClipUrl(sessionId, site.site))
              }
            />
            <Button label="Zoom in" variant="ghost" testID={`${tid}-zoom-in`} onPress={() => zoom(0.5)} />
            <Button label="Zoom out" variant="ghost" testID={`${tid}-zoom-out`} onPress={() => zoom(2)} />
            <Button label="◀ Earlier" variant="ghost" testID={`${tid}-pan-left`} onPress={() => pan(-0.5)} />
            <Button label="Later ▶" variant="ghost" testID={`${tid}-pan-right`} onPress={() => pan(0.5)} />
            <AppText variant="caption" color={colors.textMuted} testID={`${tid}-window`}>
              {window.start.toFixed(1)}–{window.end.toFixed(1)} s · drag the trace to move
              {isWeb ? '; Ctrl + wheel zooms' : ''}
            </AppText>
          </View>
          {playing && playback.error ? (
            <AppText variant="small" color={colors.danger}>
              {playback.error}
            </AppText>
          ) : null}
        </>
      )}
      {site.qualityReasons.length ? (
        <AppText variant="caption" color={colors.caution}>
          {site.qualityReasons.join(' ')}
        </AppText>
      ) : null}
      <MeasurementsTable measurements={site.measurements} sources={sources} testID={`${tid}-measurements`} />
    </Card>
  );
}

const styles = StyleSheet.create({
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  besideRow: { flexDirection: 'row', gap: space.md },
  besideCell: { flex: 1, minWidth: 0 },
  controls: { flexDirection: 'row', alignItems: 'center', gap: space.xs, flexWrap: 'wrap' },
});
