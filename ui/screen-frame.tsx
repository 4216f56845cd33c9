import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { SignOutButton } from '@/features/nav/sign-out-button';
import { colors, space } from './theme';
import { useAuth } from '@/features/auth/auth-context';
import { useLayout } from './use-layout';
import { AppText } from './app-text';
import { BrandMark } from './icons';

type Props = {
  title: string;
  subtitle?: string;
  testID: string;
  children: ReactNode;
  /** Content that stays above the scrolling part (a search box). */
  header?: ReactNode;
};

/**
 * A role screen. On phones it carries the top bar with who is signed in and sign-out (the side navigation
 * holds those on wide screens).
 */
export function ScreenFrame({ title, subtitle, testID, children, header }: Props) {
  const { isWide } = useLayout();
  const insets = useSafeAreaInsets();
  const auth = useAuth();
  return (
    <View style={styles.root} testID={testID}>
      {!isWide ? (
        <View style={[styles.topBar, { paddingTop: insets.top + space.md }]}>
          <View style={styles.brand}>
            <BrandMark size={28} color={colors.ink} accent={colors.accent} />
            <View>
              <AppText variant="smallStrong" color={colors.ink} testID="signed-in-name">
                {auth.user?.name ?? ''}
              </AppText>
              <AppText variant="caption" color={colors.textMuted}>
                Fourpoint
              </AppText>
            </View>
          </View>
          <SignOutButton />
        </View>
      ) : null}
      <View style={[styles.heading, isWide && styles.headingWide]}>
        <AppText variant={isWide ? 'display' : 'title'} color={colors.ink} accessibilityRole="header">
          {title}
        </AppText>
        {subtitle ? (
          <AppText variant="small" color={colors.textMuted}>
            {subtitle}
          </AppText>
        ) : null}
        {header}
      </View>
      <ScrollView contentContainerStyle={[styles.body, isWide && styles.bodyWide]}>{children}</ScrollView>
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  topBar: {
    flexDirection: 'row',
    alignItems: 'center',
    justifyContent: 'space-between',
    paddingHorizontal: space.lg,
    paddingBottom: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
    backgroundColor: colors.surface,
  },
  brand: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  heading: { paddingHorizontal: space.lg, paddingTop: space.lg, paddingBottom: space.md, gap: space.xs },
  headingWide: { paddingHorizontal: space.xxl, paddingTop: space.xxl, maxWidth: 1160 },
  body: { paddingHorizontal: space.lg, paddingBottom: space.xxl, gap: space.lg },
  bodyWide: { paddingHorizontal: space.xxl, maxWidth: 1160 },
});
