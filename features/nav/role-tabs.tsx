import { Tabs } from 'expo-router/js-tabs';
import type { ComponentType } from 'react';
import type { IconProps } from '@/ui/icons';
import { ScreenTopBar } from '@/ui/screen-frame';
import { colors } from '@/ui/theme';
import { useLayout } from '@/ui/use-layout';
import { AccountBar } from './account-bar';
import { NavBar } from './nav-bar';

/**
 * `Badge`, when given, renders beside the tab's label (for example the outbox's queued count). A tab owns the
 * routes under its own folder (`clients/[clientId]` belongs to `clients`) and those under the folders in `owns`.
 */
export type TabSpec = {
  name: string;
  title: string;
  Icon: ComponentType<IconProps>;
  Badge?: ComponentType;
  owns?: readonly string[];
};

const folderOf = (routeName: string) => routeName.split('/')[0];

/** The tab whose section a route is in; undefined for a route no tab owns. */
export function tabOwning(tabs: readonly TabSpec[], routeName: string): string | undefined {
  const folder = folderOf(routeName);
  return tabs.find((t) => folderOf(t.name) === folder || t.owns?.includes(folder))?.name;
}

/** One navigator per role group; its tabs are the role's sections, and its screens' phone top bar the account. */
export function RoleTabs({ tabs }: { tabs: readonly TabSpec[] }) {
  const { isWide } = useLayout();
  return (
    <ScreenTopBar value={<AccountBar />}>
      <Tabs
        tabBar={(props) => (
          <NavBar
            {...props}
            wide={isWide}
            tabNames={tabs.map((t) => t.name)}
            tabOf={(routeName) => tabOwning(tabs, routeName)}
            badges={Object.fromEntries(tabs.filter((t) => t.Badge).map((t) => [t.name, t.Badge!]))}
          />
        )}
        // Back goes to the screen the person came from (a client page before its capture), not to the first tab.
        backBehavior="history"
        screenOptions={{
          headerShown: false,
          tabBarPosition: isWide ? 'left' : 'bottom',
          sceneStyle: { backgroundColor: colors.paper },
        }}
      >
        {tabs.map(({ name, title, Icon }) => (
          <Tabs.Screen
            key={name}
            name={name}
            options={{
              title,
              tabBarButtonTestID: `nav-${name}`,
              tabBarIcon: ({ color, size }) => <Icon color={color} size={size} />,
            }}
          />
        ))}
      </Tabs>
    </ScreenTopBar>
  );
}
