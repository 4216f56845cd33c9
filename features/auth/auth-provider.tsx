import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { connectSession } from '@/api/client';
import type { SignInRequest } from '@/shared/protocol';
import { setDisplayTimeZone } from '@/ui/format';
import { AuthContext, type AuthState } from './auth-context';
import { postSignIn, postSignOut } from './sign-in-requests';
import { clearSession, loadSession, saveSession, type Session } from './session-store';

export function AuthProvider({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  const [state, setState] = useState<AuthState>({ status: 'loading', user: null });
  const sessionRef = useRef<Session | null>(null);

  const adopt = useCallback((session: Session | null) => {
    sessionRef.current = session;
    // Dates on every screen are written in the signed-in clinic's zone (the device's own when signed out).
    setDisplayTimeZone(session?.user.timeZone ?? null);
    setState(session ? { status: 'signed-in', user: session.user } : { status: 'signed-out', user: null });
  }, []);

  const forget = useCallback(async () => {
    adopt(null);
    queryClient.clear();
    await clearSession();
  }, [adopt, queryClient]);

  useEffect(() => {
    connectSession({
      get: () => sessionRef.current,
      onRefreshed: (session) => {
        adopt(session);
        void saveSession(session);
      },
      onExpired: () => void forget(),
    });
    let cancelled = false;
    void loadSession().then((session) => {
      if (!cancelled) adopt(session);
    });
    return () => {
      cancelled = true;
    };
  }, [adopt, forget]);

  const signIn = useCallback(
    async (credentials: SignInRequest) => {
      const result = await postSignIn(credentials);
      if (result.kind === 'ok') {
        await saveSession(result.data);
        adopt(result.data);
      }
      return result;
    },
    [adopt],
  );

  const signOut = useCallback(async () => {
    const session = sessionRef.current;
    // Clear locally first: signing out must work with no network; the server revokes when it can be reached.
    await forget();
    if (session) await postSignOut(session.refreshToken, session.accessToken);
  }, [forget]);

  const value = useMemo(() => ({ ...state, signIn, signOut }), [state, signIn, signOut]);
  return <AuthContext.Provider value={value}>{children}</AuthContext.Provider>;
}
