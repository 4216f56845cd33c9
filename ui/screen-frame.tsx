import { createContext, useContext, type ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { colors, space } from './theme';
import { useLayout } from './use-layout';
import { AppText } from './app-text';

const TopBar = createContext<ReactNode>(null);

/**
 * What the phone's top bar holds (who is signed in, sign-out), given by the role's navigation: ui/ draws the bar
 * and knows nothing of accounts.
 */
export const ScreenTopBar = TopBar.Provider;

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
  const topBar = useContext(TopBar);
  return (
    <View style={styles.root} testID={testID}>
      {!isWide && topBar ? (
        <View style={[styles.topBar, { paddingTop: insets.top + space.md }]}>{topBar}</View>
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
  heading: { paddingHorizontal: space.lg, paddingTop: space.lg, paddingBottom: space.md, gap: space.xs },
  headingWide: { paddingHorizontal: space.xxl, paddingTop: space.xxl, maxWidth: 1160 },
  body: { paddingHorizontal: space.lg, paddingBottom: space.xxl, gap: space.lg },
  bodyWide: { paddingHorizontal: space.xxl, maxWidth: 1160 },
});
