import { Redirect } from 'expo-router';
import type { ReactNode } from 'react';
import { useAuth } from './auth-context';
import { homeFor } from './role-home';
import type { Role } from '@/shared/protocol';
import { Splash } from './splash';

/** Lets only `role` into a route group; anyone else goes to sign-in or to their own home. */
export function RoleGuard({ role, children }: { role: Role; children: ReactNode }) {
  const auth = useAuth();
  if (auth.status === 'loading') return <Splash />;
  if (auth.status === 'signed-out') return <Redirect href="/sign-in" />;
  if (auth.user.role !== role) return <Redirect href={homeFor(auth.user.role)} />;
  return <>{children}</>;
}
