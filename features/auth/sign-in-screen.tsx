import { Redirect } from 'expo-router';
import { ScrollView, StyleSheet, View } from 'react-native';
import { AppText } from '@/ui/app-text';
import { BrandMark } from '@/ui/icons';
import { sites } from '@/shared/sites';
import { colors, radii, space } from '@/ui/theme';
import { useAuth } from './auth-context';
import { homeFor } from './role-home';
import { useLayout } from '@/ui/use-layout';
import { SignInForm } from './sign-in-form';
import { Splash } from './splash';

export function SignInScreen() {
  const auth = useAuth();
  const { isWide } = useLayout();
  if (auth.status === 'loading') return <Splash />;
  if (auth.status === 'signed-in') return <Redirect href={homeFor(auth.user.role)} />;

  const card = (
    <View style={[styles.card, isWide && styles.cardWide]}>
      <AppText variant="title" color={colors.ink} accessibilityRole="header">
        Sign in
      </AppText>
      <AppText variant="small" color={colors.textMuted}>
        Use the account your clinic gave you. Once signed in, this device keeps working without a connection.
      </AppText>
      <SignInForm onSubmit={auth.signIn} />
    </View>
  );

  if (!isWide) {
    return (
      <ScrollView style={styles.root} contentContainerStyle={styles.phone} testID="sign-in-screen">
        <View style={styles.phoneBrand}>
          <BrandMark size={44} color={colors.ink} accent={colors.accent} />
          <AppText variant="display" color={colors.ink}>
            Fourpoint
          </AppText>
          <AppText variant="small" color={colors.textMuted}>
            Heart-sound capture at four sites, for wellness follow-up.
          </AppText>
        </View>
        {card}
      </ScrollView>
    );
  }

  return (
    <View style={[styles.root, styles.wide]} testID="sign-in-screen">
      <View style={styles.panel}>
        <View style={styles.panelBrand}>
          <BrandMark size={48} color={colors.paper} accent={colors.accent} line={colors.ink} />
          <AppText variant="display" color={colors.textOnInk}>
            Fourpoint
          </AppText>
        </View>
        <AppText variant="title" color={colors.textOnInk} style={styles.tagline}>
          Four listening points, one steady record across every visit.
        </AppText>
        <View style={styles.siteList}>
          {sites.map((s, i) => (
            <View key={s.id} style={styles.siteRow}>
              <AppText variant="number" color={colors.accent}>
                {String(i + 1).padStart(2, '0')}
              </AppText>
              <AppText variant="bodyStrong" color={colors.textOnInk}>
                {s.label}
              </AppText>
            </View>
          ))}
        </View>
      </View>
      <View style={styles.formSide}>{card}</View>
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  phone: { padding: space.xl, paddingTop: space.xxxl, gap: space.xl },
  phoneBrand: { gap: space.sm },
  card: {
    backgroundColor: colors.surface,
    borderRadius: radii.lg,
    borderWidth: 1,
    borderColor: colors.line,
    padding: space.xl,
    gap: space.md,
  },
  cardWide: { width: 420, padding: space.xxl },
  wide: { flexDirection: 'row' },
  panel: {
    flex: 1,
    backgroundColor: colors.ink,
    padding: space.xxxl,
    justifyContent: 'center',
    gap: space.xxl,
  },
  panelBrand: { flexDirection: 'row', alignItems: 'center', gap: space.lg },
  tagline: { maxWidth: 460 },
  siteList: { gap: space.md },
  siteRow: { flexDirection: 'row', alignItems: 'center', gap: space.lg },
  formSide: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: space.xxl },
});
