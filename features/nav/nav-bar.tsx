import type { BottomTabBarProps } from 'expo-router/js-tabs';
import { useState, type ComponentType } from 'react';
import { Modal, Pressable, StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { AppText } from '@/ui/app-text';
import { BrandMark, MoreIcon } from '@/ui/icons';
import { colors, radii, sideNavWidth, space } from '@/ui/theme';
import { useAuth } from '@/features/auth/auth-context';
import { roleLabels } from './role-labels';
import { SignOutButton } from './sign-out-button';

type Props = BottomTabBarProps & {
  wide: boolean;
  tabNames: readonly string[];
  /** The tab a route belongs to (a client's page to Clients), so the bar shows the section a person is in. */
  tabOf: (routeName: string) => string | undefined;
  badges?: Readonly<Record<string, ComponentType>>;
};

// A phone's bar holds five places at 390 px; with more sections, the last place opens "More" with the rest, so
// every section stays one or two taps away (a bar that scrolls sideways hides them instead).
const MAX_BOTTOM_PLACES = 5;

/** Our own tab bar: a side navigation on wide screens, bottom tabs on phones. */
export function NavBar({ state, descriptors, navigation, wide, tabNames, tabOf, badges = {} }: Props) {
  const insets = useSafeAreaInsets();
  const auth = useAuth();
  const [moreOpen, setMoreOpen] = useState(false);
  const overflows = !wide && tabNames.length > MAX_BOTTOM_PLACES;
  const inBar = overflows ? tabNames.slice(0, MAX_BOTTOM_PLACES - 1) : tabNames;
  const shownName = state.routes[state.index]?.name;
  const focusedName = shownName === undefined ? undefined : tabOf(shownName);

  // Routes that are not tabs (detail pages, steppers) live in the group but stay out of the bar.
  const item = (name: string, place: 'side' | 'bottom' | 'menu') => {
    const index = state.routes.findIndex((route) => route.name === name);
    const route = state.routes[index];
    if (!route) return null;
    const { options } = descriptors[route.key];
    const focused = route.name === focusedName;
    const label = options.title ?? route.name;
    const Badge = badges[route.name];
    const tint =
      place === 'side'
        ? focused
          ? colors.textOnInk
          : colors.textOnInkMuted
        : focused
          ? colors.accent
          : colors.textMuted;
    const onPress = () => {
      setMoreOpen(false);
      const event = navigation.emit({ type: 'tabPress', target: route.key, canPreventDefault: true });
      // From a page inside the section (a client's page), the tab leads back to the section's first page.
      if (state.index !== index && !event.defaultPrevented) navigation.navigate(route.name, route.params);
    };
    return (
      <Pressable
        key={route.key}
        testID={options.tabBarButtonTestID ?? `nav-${route.name}`}
        accessibilityRole={place === 'menu' ? 'menuitem' : 'tab'}
        accessibilityState={{ selected: focused }}
        accessibilityLabel={label}
        onPress={onPress}
        style={({ pressed }) => [
          styles[`${place}Item`],
          place === 'side' && focused && styles.sideItemFocused,
          place === 'menu' && focused && styles.menuItemFocused,
          pressed && (place === 'side' ? styles.sideItemPressed : styles.bottomItemPressed),
        ]}
      >
        {options.tabBarIcon?.({ focused, color: tint, size: 22 })}
        <AppText variant={place === 'bottom' ? 'caption' : 'smallStrong'} color={tint}>
          {label}
        </AppText>
        {Badge ? (
          <View style={place === 'bottom' ? styles.badgeBottom : styles.badgeSide} pointerEvents="none">
            <Badge />
          </View>
        ) : null}
      </Pressable>
    );
  };

  if (!wide) {
    const inMenu = tabNames.filter((name) => !inBar.includes(name));
    const moreFocused = focusedName !== undefined && inMenu.includes(focusedName);
    const moreTint = moreFocused || moreOpen ? colors.accent : colors.textMuted;
    return (
      <View
        style={[styles.bottom, { paddingBottom: Math.max(insets.bottom, space.sm) }]}
        testID="bottom-tabs"
      >
        {inBar.map((name) => item(name, 'bottom'))}
        {overflows ? (
          <Pressable
            testID="nav-more"
            accessibilityRole="button"
            accessibilityLabel="More sections"
            accessibilityState={{ expanded: moreOpen }}
            onPress={() => setMoreOpen(true)}
            style={({ pressed }) => [styles.bottomItem, pressed && styles.bottomItemPressed]}
          >
            <MoreIcon color={moreTint} />
            <AppText variant="caption" color={moreTint}>
              More
            </AppText>
          </Pressable>
        ) : null}
        <Modal visible={moreOpen} transparent animationType="fade" onRequestClose={() => setMoreOpen(false)}>
          <Pressable
            style={styles.menuBackdrop}
            onPress={() => setMoreOpen(false)}
            accessibilityLabel="Close the menu"
            testID="nav-more-close"
          />
          <View
            style={[styles.menu, { paddingBottom: Math.max(insets.bottom, space.md) }]}
            accessibilityRole="menu"
            testID="nav-more-menu"
          >
            {inMenu.map((name) => item(name, 'menu'))}
          </View>
        </Modal>
      </View>
    );
  }

  const items = tabNames.map((name) => item(name, 'side'));

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
  menuBackdrop: { flex: 1, backgroundColor: 'rgba(18, 52, 59, 0.35)' },
  menu: {
    backgroundColor: colors.surface,
    borderTopLeftRadius: radii.lg,
    borderTopRightRadius: radii.lg,
    paddingTop: space.md,
    paddingHorizontal: space.md,
    gap: space.xs,
  },
  menuItem: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    minHeight: 48,
    paddingHorizontal: space.md,
    borderRadius: radii.md,
  },
  menuItemFocused: { backgroundColor: colors.surfaceMuted },
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
