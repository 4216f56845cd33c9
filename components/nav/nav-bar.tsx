import type { BottomTabBarProps } from 'expo-router/js-tabs';
import type { ComponentType } from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { AppText } from '@/components/ui/app-text';
import { BrandMark } from '@/components/ui/icons';
import { colors, radii, sideNavWidth, space } from '@/constants/theme';
import { useAuth } from '@/hooks/auth/auth-context';
import { roleLabels } from './role-labels';
import { SignOutButton } from './sign-out-button';

type Props = BottomTabBarProps & {
  wide: boolean;
  tabNames: readonly string[];
  badges?: Readonly<Record<string, ComponentType>>;
};

// More tabs than fit a phone's width scroll sideways instead of squeezing their labels.
const MAX_FIXED_BOTTOM_TABS = 5;

/** Our own tab bar: a side navigation on wide screens, bottom tabs on phones. */
export function NavBar({ state, descriptors, navigation, wide, tabNames, badges = {} }: Props) {
  const insets = useSafeAreaInsets();
  const auth = useAuth();
  const scrolls = !wide && tabNames.length > MAX_FIXED_BOTTOM_TABS;
  // Routes that are not tabs (detail pages, steppers) live in the group but stay out of the bar.
  const items = state.routes.map((route, index) => {
    if (!tabNames.includes(route.name)) return null;
    const { options } = descriptors[route.key];
    const focused = state.index === index;
    const label = options.title ?? route.name;
    const Badge = badges[route.name];
    const tint = wide
      ? focused
        ? colors.textOnInk
        : colors.textOnInkMuted
      : focused
        ? colors.accent
        : colors.textMuted;
    const onPress = () => {
      const event = navigation.emit({ type: 'tabPress', target: route.key, canPreventDefault: true });
      if (!focused && !event.defaultPrevented) navigation.navigate(route.name, route.params);
    };
    return (
      <Pressable
        key={route.key}
        testID={options.tabBarButtonTestID ?? `nav-${route.name}`}
        accessibilityRole="tab"
        accessibilityState={{ selected: focused }}
        accessibilityLabel={label}
        onPress={onPress}
        style={({ pressed }) => [
          wide ? styles.sideItem : scrolls ? styles.bottomItemScrolling : styles.bottomItem,
          wide && focused && styles.sideItemFocused,
          pressed && (wide ? styles.sideItemPressed : styles.bottomItemPressed),
        ]}
      >
        {options.tabBarIcon?.({ focused, color: tint, size: 22 })}
        <AppText variant={wide ? 'smallStrong' : 'caption'} color={tint}>
          {label}
        </AppText>
        {Badge ? (
          <View style={wide ? styles.badgeSide : styles.badgeBottom} pointerEvents="none">
            <Badge />
          </View>
        ) : null}
      </Pressable>
    );
  });

  if (!wide) {
    const padding = { paddingBottom: Math.max(insets.bottom, space.sm) };
    if (scrolls) {
      return (
        <View style={[styles.bottom, padding]} testID="bottom-tabs">
          <ScrollView
            horizontal
            showsHorizontalScrollIndicator={false}
            contentContainerStyle={styles.bottomScroll}
          >
            {items}
          </ScrollView>
        </View>
      );
    }
    return (
      <View style={[styles.bottom, padding]} testID="bottom-tabs">
        {items}
      </View>
    );
  }

  return (
    <View style={styles.side} testID="side-nav">
      <View style={styles.brand}>
        <BrandMark size={36} color={colors.paper} accent={colors.accent} line={colors.ink} />
        <AppText variant="heading" color={colors.textOnInk}>
          Fourpoint
        </AppText>
      </View>
      <View style={styles.sideItems}>{items}</View>
      {auth.status === 'signed-in' ? (
        <View style={styles.account} testID="side-nav-account">
          <AppText variant="smallStrong" color={colors.textOnInk} testID="signed-in-name">
            {auth.user.name}
          </AppText>
          <AppText variant="caption" color={colors.textOnInkMuted}>
            {roleLabels[auth.user.role]}
          </AppText>
          <AppText variant="caption" color={colors.textOnInkMuted} numberOfLines={1}>
            {auth.user.email}
          </AppText>
          <View style={styles.signOut}>
            <SignOutButton onInk />
          </View>
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  bottom: {
    flexDirection: 'row',
    backgroundColor: colors.surface,
    borderTopWidth: 1,
    borderTopColor: colors.line,
    paddingTop: space.sm,
  },
  bottomItem: { flex: 1, alignItems: 'center', gap: 2, paddingVertical: space.xs, borderRadius: radii.md },
  badgeSide: { marginLeft: 'auto' },
  badgeBottom: { position: 'absolute', top: 0, left: '55%' },
  bottomScroll: { paddingHorizontal: space.xs },
  bottomItemScrolling: {
    width: 76,
    alignItems: 'center',
    gap: 2,
    paddingVertical: space.xs,
    borderRadius: radii.md,
  },
  bottomItemPressed: { backgroundColor: colors.surfaceMuted },
  side: {
    width: sideNavWidth,
    backgroundColor: colors.ink,
    paddingHorizontal: space.lg,
    paddingVertical: space.xl,
    gap: space.xl,
  },
  brand: { flexDirection: 'row', alignItems: 'center', gap: space.md, paddingHorizontal: space.sm },
  sideItems: { gap: space.xs, flex: 1 },
  sideItem: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.md,
    paddingVertical: space.md,
    borderRadius: radii.md,
  },
  sideItemFocused: { backgroundColor: colors.inkSoft },
  sideItemPressed: { backgroundColor: colors.inkSoft },
  account: { borderTopWidth: 1, borderTopColor: colors.inkSoft, paddingTop: space.lg, gap: 2 },
  signOut: { marginTop: space.md },
});
