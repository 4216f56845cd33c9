import { lazy, Suspense, type ComponentType } from 'react';
import { Splash } from '@/features/auth/splash';

/**
 * A role's layout, loaded the first time its group is shown. Expo Router evaluates every `_layout` file at
 * start-up (it reads their `unstable_settings`), so a group layout that imported its role's code directly would run
 * it all (the phone's database, the sync engine, sealing, the role's bars) before the sign-in form could paint.
 * The layout file stays a one-line export: `export default lazyLayout(() => import('…').then((m) => m.XLayout))`.
 */
export function lazyLayout(load: () => Promise<ComponentType>): ComponentType {
  const Layout = lazy(async () => ({ default: await load() }));
  function LazyLayout() {
    return (
      <Suspense fallback={<Splash />}>
        <Layout />
      </Suspense>
    );
  }
  return LazyLayout;
}
