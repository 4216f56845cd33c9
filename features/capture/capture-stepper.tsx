import { Pressable, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import type { SiteRecording } from '@/device/local-store/records';
import type { Site } from '@/shared/protocol';

export type StepState = 'todo' | 'current' | 'recorded' | 'kept-poor' | 'skipped';

export function stepState(site: Site, current: Site | 'review', recordings: SiteRecording[]): StepState {
  if (site === current) return 'current';
  const done = recordings.find((r) => r.site === site);
  if (!done) return 'todo';
  if (done.outcome === 'skipped') return 'skipped';
  return done.verdict === 'retake' ? 'kept-poor' : 'recorded';
}

/** The first site in order still without a take or a skip; 'review' when all four are settled. */
export function nextOpenSite(recordings: SiteRecording[], after?: Site): Site | 'review' {
  const settled = new Set(recordings.map((r) => r.site));
  const start = after ? sites.findIndex((s) => s.id === after) + 1 : 0;
  const ordered = [...sites.slice(start), ...sites.slice(0, start)];
  return ordered.find((s) => !settled.has(s.id))?.id ?? 'review';
}

const marks: Record<StepState, { text: string; bg: string; fg: string }> = {
  todo: { text: '', bg: colors.surface, fg: colors.textMuted },
  current: { text: '●', bg: colors.ink, fg: colors.textOnInk },
  recorded: { text: '✓', bg: colors.pulseSoft, fg: colors.pulse },
  'kept-poor': { text: '!', bg: colors.cautionSoft, fg: colors.caution },
  skipped: { text: '–', bg: colors.surfaceMuted, fg: colors.textMuted },
};

type Props = {
  current: Site | 'review';
  recordings: SiteRecording[];
  onSelect: (site: Site) => void;
  disabled?: boolean;
};

/** Four steps in capture order; any step can be opened again to redo it before finishing. */
export function CaptureStepper({ current, recordings, onSelect, disabled = false }: Props) {
  return (
    <View style={styles.row} testID="capture-stepper" accessibilityRole="tablist">
      {sites.map((site, index) => {
        const state = stepState(site.id, current, recordings);
        const mark = marks[state];
        return (
          <Pressable
            key={site.id}
            testID={`step-${site.id}`}
            accessibilityRole="tab"
            accessibilityLabel={`${site.label}: ${state}`}
            accessibilityState={{ selected: state === 'current', disabled }}
            disabled={disabled}
            onPress={() => onSelect(site.id)}
            style={[
              styles.step,
              { backgroundColor: mark.bg, borderColor: state === 'current' ? colors.ink : colors.line },
            ]}
          >
            <AppText variant="caption" color={mark.fg}>
              {index + 1} {mark.text}
            </AppText>
            <AppText variant="smallStrong" color={mark.fg} testID={`step-${site.id}-${state}`}>
              {site.label}
            </AppText>
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', gap: space.xs },
  step: {
    flex: 1,
    borderWidth: 1,
    borderRadius: radii.md,
    paddingVertical: space.sm,
    paddingHorizontal: space.xs,
    alignItems: 'center',
    gap: 2,
  },
});
