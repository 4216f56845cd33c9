import { Redirect } from 'expo-router';
import { useAuth } from './auth-context';
import { homeFor } from './role-home';
import { Splash } from './splash';

export function StartRedirect() {
  const auth = useAuth();
  if (auth.status === 'loading') return <Splash />;
  if (auth.status === 'signed-out') return <Redirect href="/sign-in" />;
  return <Redirect href={homeFor(auth.user.role)} />;
}
