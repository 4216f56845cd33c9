import { Redirect } from 'expo-router';
import { useAuth } from '@/hooks/auth/auth-context';
import { homeFor } from '@/hooks/auth/role-home';
import { Splash } from './splash';

export function StartRedirect() {
  const auth = useAuth();
  if (auth.status === 'loading') return <Splash />;
  if (auth.status === 'signed-out') return <Redirect href="/sign-in" />;
  return <Redirect href={homeFor(auth.user.role)} />;
}
