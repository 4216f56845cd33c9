import { StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { Badge } from '@/ui/badge';
import { referToClinician } from '@/shared/cautions';
import { siteInfo } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import type { ReviewSite } from '@/shared/protocol/review';
import { murmurWords, outOfRangeWords, recordingWords } from './review-words';

/** One line per site before anything else: rate, recording quality, murmur screen, measures out of range. */
export function SiteSummaryStrip({ sites }: { sites: ReviewSite[] }) {
  return (
    <View style={styles.strip} testID="site-summary">
      {sites.map((site) => {
        const tid = `site-summary-${site.site}`;
        const label = siteInfo(site.site).label;
        if (site.skippedReason || !site.recordingId)
          return (
            <View key={site.site} style={styles.row} testID={tid}>
              <AppText variant="bodyStrong" color={colors.ink} style={styles.site}>
                {label}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                {site.skippedReason ? `Skipped: ${site.skippedReason}` : 'Not recorded'}
              </AppText>
            </View>
          );
        const quality = site.qualityVerdict ? recordingWords(site.qualityVerdict) : null;
        const murmur = murmurWords(site.murmurScreen);
        const out = outOfRangeWords(site);
        return (
          <View key={site.site} style={styles.row} testID={tid}>
            <AppText variant="bodyStrong" color={colors.ink} style={styles.site}>
              {label}
            </AppText>
            <AppText variant="number" color={colors.ink} style={styles.rate}>
              {site.heartRateBpm !== null ? `${Math.round(site.heartRateBpm)} bpm` : 'rate not measured'}
            </AppText>
            {quality ? <Badge label={quality.label} tone={quality.tone} /> : null}
            <Badge label={murmur.label} tone={murmur.tone} testID={`${tid}-murmur`} />
            <Badge label={out.label} tone={out.tone} testID={`${tid}-out`} />
            {site.irregularRhythm ? (
              <Badge label={`Irregular rhythm: ${referToClinician}`} tone="danger" />
            ) : null}
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  strip: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.md,
    gap: space.sm,
  },
  row: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: space.sm },
  site: { minWidth: 90 },
  rate: { minWidth: 80 },
});
