import { createContext, useContext } from 'react';
import type { ApiResult } from '@/api/result';
import type { SignInRequest, SignInResponse, User } from '@/shared/protocol';

export type AuthState =
  | { status: 'loading'; user: null }
  | { status: 'signed-out'; user: null }
  | { status: 'signed-in'; user: User };

export type AuthContextValue = AuthState & {
  signIn: (credentials: SignInRequest) => Promise<ApiResult<SignInResponse>>;
  signOut: () => Promise<void>;
};

export const AuthContext = createContext<AuthContextValue | null>(null);

export function useAuth(): AuthContextValue {
  const value = useContext(AuthContext);
  if (!value) throw new Error('useAuth needs an <AuthProvider> above it.');
  return value;
}
