import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import type { SiteVerdict } from '@/shared/protocol';
import { verdictWords } from '@/ui/verdicts';
import { siteVerdictLook } from './session-labels';

const toneColors = {
  good: { bg: colors.pulseSoft, fg: colors.pulse },
  caution: { bg: colors.cautionSoft, fg: colors.caution },
  danger: { bg: colors.dangerSoft, fg: colors.danger },
  neutral: { bg: colors.surfaceMuted, fg: colors.textMuted },
  ink: { bg: colors.ink, fg: colors.textOnInk },
};

/** One chip per site in capture order, coloured by recording quality. */
export function SiteChips({ verdicts, testID }: { verdicts: SiteVerdict[]; testID: string }) {
  return (
    <View style={styles.row} testID={testID}>
      {sites.map((site) => {
        const v = verdicts.find((x) => x.site === site.id);
        const look = v ? siteVerdictLook(v) : { label: 'Not recorded', tone: 'neutral' as const };
        const c = toneColors[look.tone];
        return (
          <View
            key={site.id}
            style={[styles.chip, { backgroundColor: c.bg }]}
            accessibilityLabel={`${site.label}: ${look.label}`}
          >
            <AppText variant="caption" color={c.fg}>
              {site.label.charAt(0)}
            </AppText>
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', gap: space.xs },
  chip: { width: 26, height: 26, borderRadius: radii.sm, alignItems: 'center', justifyContent: 'center' },
  legend: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  legendItem: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  swatch: { width: 12, height: 12, borderRadius: 3, borderWidth: 1 },
});

const legend = [
  ...Object.values(verdictWords),
  { label: 'Not recorded or skipped', tone: 'neutral' },
] as const;

/** Explains the chips: letters are sites, colours are recording quality (not findings). */
export function SiteLegend() {
  return (
    <View style={styles.legend} testID="site-legend">
      <AppText variant="caption" color={colors.textMuted}>
        {sites.map((s) => `${s.label.charAt(0)} ${s.label.toLowerCase()}`).join(' · ')}. Colour is recording
        quality:
      </AppText>
      {legend.map((l) => (
        <View key={l.label} style={styles.legendItem}>
          <View
            style={[
              styles.swatch,
              { backgroundColor: toneColors[l.tone].bg, borderColor: toneColors[l.tone].fg },
            ]}
          />
          <AppText variant="caption" color={colors.textMuted}>
            {l.label}
          </AppText>
        </View>
      ))}
    </View>
  );
}
