import { Slot } from 'expo-router';
import { renderRouter, screen } from 'expo-router/testing-library';
import { Text } from 'react-native';
import { AuthContext, type AuthContextValue, type AuthState } from './auth-context';
import type { Role } from '@/shared/protocol';
import { RoleGuard } from './role-guard';

function authValue(state: AuthState): AuthContextValue {
  return { ...state, signIn: jest.fn(), signOut: jest.fn() };
}

function signedInAs(role: Role): AuthState {
  return {
    status: 'signed-in',
    user: {
      id: '3f1e8c52-7a0b-4d4e-9b1c-5e2f7a8d9c01',
      email: `${role}-guard@demo.fourpoint.test`,
      role,
      clinicId: '8d2c4b6a-1e3f-4a5b-9c7d-0e1f2a3b4c5d',
      timeZone: 'UTC',
      name: `Guard ${role}`,
    },
  };
}

function renderApp(state: AuthState, initialUrl: string) {
  const value = authValue(state);
  const Root = () => (
    <AuthContext.Provider value={value}>
      <Slot />
    </AuthContext.Provider>
  );
  const guarded = (role: Role) => () => (
    <RoleGuard role={role}>
      <Slot />
    </RoleGuard>
  );
  return renderRouter(
    {
      _layout: Root,
      'sign-in': () => <Text testID="sign-in-page">sign in</Text>,
      '(operator)/_layout': guarded('operator'),
      '(operator)/clients': () => <Text testID="operator-page">clients</Text>,
      '(practitioner)/_layout': guarded('practitioner'),
      '(practitioner)/sessions': () => <Text testID="practitioner-page">sessions</Text>,
      '(admin)/_layout': guarded('admin'),
      '(admin)/admin': () => <Text testID="admin-page">admin</Text>,
    },
    { initialUrl },
  );
}

describe('RoleGuard', () => {
  test('when a practitioner opens the operator group, then they land on their own home', async () => {
    const router = renderApp(signedInAs('practitioner'), '/clients');
    expect(await screen.findByTestId('practitioner-page')).toBeTruthy();
    expect(screen.queryByTestId('operator-page')).toBeNull();
    expect(router.getPathname()).toBe('/sessions');
  });

  test('when an operator opens the admin group, then they land on the clients home', async () => {
    const router = renderApp(signedInAs('operator'), '/admin');
    expect(await screen.findByTestId('operator-page')).toBeTruthy();
    expect(router.getPathname()).toBe('/clients');
  });

  test('when nobody is signed in, then a guarded page sends them to sign-in', async () => {
    const router = renderApp({ status: 'signed-out', user: null }, '/sessions');
    expect(await screen.findByTestId('sign-in-page')).toBeTruthy();
    expect(router.getPathname()).toBe('/sign-in');
  });

  test('when the right role opens its group, then the page shows', async () => {
    const router = renderApp(signedInAs('admin'), '/admin');
    expect(await screen.findByTestId('admin-page')).toBeTruthy();
    expect(router.getPathname()).toBe('/admin');
  });
});
