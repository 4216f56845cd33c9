import { StyleSheet, View } from 'react-native';
import { roleLabels } from '@/features/nav/role-labels';
import { AppText } from '@/ui/app-text';
import { CautionLine } from '@/ui/caution-line';
import { ScreenFrame } from '@/ui/screen-frame';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import { useAuth } from './auth-context';

export function OperatorAccountScreen() {
  const auth = useAuth();
  return (
    <ScreenFrame
      title="Account"
      subtitle="Who is signed in on this device, and the capture order."
      testID="operator-account"
    >
      {auth.status === 'signed-in' ? (
        <View style={styles.card} testID="account-details">
          <AppText variant="caption" color={colors.textMuted}>
            SIGNED IN AS
          </AppText>
          <AppText variant="heading" color={colors.ink}>
            {auth.user.name}
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            {auth.user.email} · {roleLabels[auth.user.role]}
          </AppText>
        </View>
      ) : null}
      <View style={styles.card} testID="site-guide">
        <AppText variant="caption" color={colors.textMuted}>
          CAPTURE ORDER
        </AppText>
        {sites.map((s, i) => (
          <View key={s.id} style={styles.site}>
            <AppText variant="number" color={colors.accent}>
              {String(i + 1).padStart(2, '0')}
            </AppText>
            <View style={styles.siteText}>
              <AppText variant="bodyStrong" color={colors.ink}>
                {s.label}
              </AppText>
              <AppText variant="small" color={colors.textMuted}>
                {s.placement}
              </AppText>
            </View>
          </View>
        ))}
      </View>
      <CautionLine />
    </ScreenFrame>
  );
}

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radii.md,
    padding: space.lg,
    gap: space.sm,
    maxWidth: 640,
  },
  site: { flexDirection: 'row', gap: space.md, paddingVertical: space.xs },
  siteText: { flex: 1, gap: 2 },
});
