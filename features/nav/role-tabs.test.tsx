// Every page of a role's group lights one tab of its bar, so a person always sees which section they are in.
// The pages are read from the app/ folder itself, so a new page without an owning tab fails here.
import fs from 'node:fs';
import path from 'node:path';
import { adminTabs } from './admin-layout';
import { operatorTabs } from './operator-layout';
import { practitionerTabs } from './practitioner-layout';
import { tabOwning, type TabSpec } from './role-tabs';

const appDir = path.resolve(__dirname, '../../app');

/** Expo Router's route names for a group's pages: the file's path without `.tsx`, layouts left out. */
function routesOf(group: string): string[] {
  const dir = path.join(appDir, group);
  return (fs.readdirSync(dir, { recursive: true }) as string[])
    .filter((file) => file.endsWith('.tsx') && !file.endsWith('_layout.tsx'))
    .map((file) =>
      file
        .replace(/\.tsx$/, '')
        .split(path.sep)
        .join('/'),
    );
}

describe.each([
  ['(admin)', adminTabs],
  ['(operator)', operatorTabs],
  ['(practitioner)', practitionerTabs],
] as const)('the %s group', (group, tabs: readonly TabSpec[]) => {
  test('when any of its pages is shown, then exactly the tab of its section is lit', () => {
    const routes = routesOf(group);
    expect(routes.length).toBeGreaterThan(tabs.length - 1);
    for (const route of routes) expect([route, tabOwning(tabs, route)]).toEqual([route, expect.any(String)]);
    // A tab's own page lights that tab.
    for (const tab of tabs) expect(tabOwning(tabs, tab.name)).toBe(tab.name);
  });
});

test('when a client page or a capture is shown, then Clients is lit, not the first tab', () => {
  expect(tabOwning(practitionerTabs, 'review-clients/[clientId]/trends')).toBe('review-clients/index');
  expect(tabOwning(practitionerTabs, 'sessions/[sessionId]')).toBe('sessions');
  expect(tabOwning(operatorTabs, 'capture/[sessionId]')).toBe('clients');
  expect(tabOwning(adminTabs, 'conflicts/[conflictId]')).toBe('conflicts/index');
});
