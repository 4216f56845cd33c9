import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Button } from '@/ui/button';
import { CautionNote } from '@/ui/caution-note';
import { siteInfo } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import type { RecordingSource, SiteRecording } from '@/device/local-store/records';
import { useAudioInputs } from '@/device/recorder/inputs';
import { playClip } from '@/device/recorder/playback';
import { takeLengths, useTakeLength } from '@/device/recorder/take-length';
import { encodeWav16 } from '@/shared/analysis/wav';
import type { Site } from '@/shared/protocol';
import { Countdown } from './countdown';
import { InputPicker } from './input-picker';
import { LevelMeter } from './level-meter';
import { SitePicture } from './site-picture';
import { SkipSiteForm } from './skip-site-form';
import { TraceView } from './trace-view';
import { useTake, type TakeResult } from './use-take';
import { VerdictPanel } from './verdict-panel';

type Props = {
  site: Site;
  defaultLengthS: number;
  existing: SiteRecording | undefined;
  width: number;
  saving: boolean;
  saveError: string | null;
  onKeep: (result: TakeResult, note: string | null) => void;
  onSkip: (reason: string) => void;
  onBack: (() => void) | null;
};

/** One site: where to place the chest piece, then a take (recorded or imported), its trace and verdict. */
export function SiteStep({
  site,
  defaultLengthS,
  existing,
  width,
  saving,
  saveError,
  onKeep,
  onSkip,
  onBack,
}: Props) {
  const info = siteInfo(site);
  const [lengthS, setLengthS] = useTakeLength(defaultLengthS);
  const [skipping, setSkipping] = useState(false);
  const audioInputs = useAudioInputs();
  // A kept input that is unplugged now falls back to the default rather than failing the take.
  const take = useTake(
    site,
    lengthS,
    audioInputs.chosenMissing ? null : audioInputs.chosen,
    audioInputs.refresh,
  );
  const { state } = take;
  const traceWidth = Math.max(200, width);

  return (
    <View style={styles.root} testID={`site-step-${site}`}>
      <View style={styles.card}>
        <SitePicture site={site} size={width < 360 ? 120 : 140} />
        <View style={styles.cardText}>
          <AppText variant="heading" color={colors.ink} testID="site-title">
            {info.label}
          </AppText>
          <AppText variant="small" color={colors.text} testID="site-instruction">
            {info.placement}
          </AppText>
          {existing ? (
            <AppText variant="caption" color={colors.textMuted} testID="site-existing">
              {existing.outcome === 'skipped'
                ? `Skipped: ${existing.skipReason ?? ''}. Record now to replace.`
                : 'A take is kept for this site. A new one replaces it.'}
            </AppText>
          ) : null}
        </View>
      </View>

      {state.phase === 'idle' || state.phase === 'error' ? (
        skipping ? (
          <SkipSiteForm busy={saving} onCancel={() => setSkipping(false)} onSkip={onSkip} />
        ) : (
          <View style={styles.controls}>
            {state.phase === 'error' ? (
              <View style={styles.error} testID={`take-error-${state.kind}`} accessibilityRole="alert">
                <AppText variant="small" color={colors.danger}>
                  {state.message}
                </AppText>
              </View>
            ) : null}
            <AppText variant="caption" color={colors.textMuted}>
              TAKE LENGTH
            </AppText>
            <View style={styles.lengths}>
              {takeLengths.map((s) => (
                <View key={s} style={styles.lengthButton}>
                  <Button
                    label={`${s} s`}
                    variant={s === lengthS ? 'primary' : 'secondary'}
                    onPress={() => setLengthS(s)}
                    testID={`length-${s}`}
                  />
                </View>
              ))}
            </View>
            <InputPicker
              inputs={audioInputs.inputs}
              chosen={audioInputs.chosen}
              chosenMissing={audioInputs.chosenMissing}
              onChoose={(id) => void audioInputs.choose(id)}
            />
            <Button label={`Record ${lengthS} s`} onPress={() => void take.record()} testID="record" />
            <Button
              label="Import a file instead"
              onPress={() => void take.importFile()}
              testID="import"
              variant="secondary"
            />
            <View style={styles.row}>
              {onBack ? <Button label="Back" onPress={onBack} testID="step-back" variant="ghost" /> : null}
              <Button
                label="Skip this site"
                onPress={() => setSkipping(true)}
                testID="skip"
                variant="ghost"
              />
            </View>
          </View>
        )
      ) : null}

      {state.phase === 'starting' ? (
        <AppText variant="small" color={colors.textMuted} testID="mic-starting">
          Opening the microphone…
        </AppText>
      ) : null}

      {state.phase === 'recording' ? (
        <View style={styles.controls} testID="recording">
          <Countdown remainingS={lengthS - state.elapsedS} totalS={lengthS} />
          <LevelMeter level={state.level} />
          <Button label="Stop now" onPress={() => void take.stop()} testID="stop" variant="secondary" />
        </View>
      ) : null}

      {state.phase === 'analysing' ? (
        <AppText variant="small" color={colors.textMuted} testID="analysing">
          Analysing the take…
        </AppText>
      ) : null}

      {state.phase === 'done' ? (
        <View style={styles.controls} testID="take-result">
          <View style={styles.traceBox}>
            <TraceView
              trace={state.result.trace}
              sounds={state.result.analysis.sounds}
              width={traceWidth - 2}
            />
          </View>
          <AppText variant="caption" color={colors.textMuted} testID="take-source">
            {sourceLabel(state.result.source)} · {state.result.analysis.durationS.toFixed(1)} s · S1 shaded
            brick, S2 shaded mint
          </AppText>
          {saveError ? (
            <View style={styles.error} testID="save-error" accessibilityRole="alert">
              <AppText variant="small" color={colors.danger}>
                {saveError}
              </AppText>
            </View>
          ) : null}
          <Button
            label="Play the take"
            variant="ghost"
            onPress={() => playClip(encodeWav16(state.result.pcm.samples, state.result.pcm.sampleRate))}
            testID="play-take"
          />
          <VerdictPanel
            analysis={state.result.analysis}
            busy={saving}
            onRetake={take.reset}
            onKeep={(note) => onKeep(state.result, note)}
          />
          <CautionNote compact />
        </View>
      ) : null}
    </View>
  );
}

function sourceLabel(source: RecordingSource): string {
  return source === 'microphone' ? 'Recorded' : 'Imported';
}

const styles = StyleSheet.create({
  root: { gap: space.lg },
  card: {
    flexDirection: 'row',
    gap: space.md,
    padding: space.md,
    backgroundColor: colors.surface,
    borderRadius: radii.lg,
    borderWidth: 1,
    borderColor: colors.line,
    alignItems: 'center',
  },
  cardText: { flex: 1, gap: space.xs },
  controls: { gap: space.md },
  lengths: { flexDirection: 'row', gap: space.sm },
  lengthButton: { flex: 1 },
  row: { flexDirection: 'row', gap: space.sm, justifyContent: 'space-between' },
  error: { padding: space.md, borderRadius: radii.md, backgroundColor: colors.dangerSoft },
  traceBox: { borderWidth: 1, borderColor: colors.line, borderRadius: radii.md, overflow: 'hidden' },
});
