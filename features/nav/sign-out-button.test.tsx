import { fireEvent, render, screen } from '@testing-library/react-native';
import { AuthContext, type AuthContextValue } from '@/features/auth/auth-context';
import { DeviceSyncContext, type DeviceSyncState, type UnsentSummary } from '@/device/sync/sync-context';
import { SignOutButton, unsentWords } from './sign-out-button';

function renderWith(unsent: UnsentSummary | undefined) {
  const signOut = jest.fn(() => Promise.resolve());
  const auth = {
    status: 'signed-in',
    user: { id: 'u', name: 'Operator', email: 'o@example.test', role: 'operator' },
    signIn: jest.fn(),
    signOut,
  } as unknown as AuthContextValue;
  const sync: DeviceSyncState = {
    ready: true,
    running: false,
    online: false,
    unsent,
    syncNow: jest.fn(() => Promise.resolve(null)),
  };
  render(
    <AuthContext.Provider value={auth}>
      <DeviceSyncContext.Provider value={sync}>
        <SignOutButton />
      </DeviceSyncContext.Provider>
    </AuthContext.Provider>,
  );
  return signOut;
}

test('when recordings have not reached the clinic, then signing out first says what would wait on the phone', () => {
  const signOut = renderWith({ items: 11, recordings: 4, sessions: 1, clients: 1 });
  fireEvent.press(screen.getByTestId('sign-out-button'));
  expect(signOut).not.toHaveBeenCalled();
  expect(screen.getByTestId('sign-out-warning-text')).toHaveTextContent(
    '4 recordings from 1 session have not reached the clinic yet. They stay sealed on this phone and are sent after the next sign-in here.',
  );
  fireEvent.press(screen.getByTestId('sign-out-cancel'));
  expect(signOut).not.toHaveBeenCalled();
  fireEvent.press(screen.getByTestId('sign-out-button'));
  fireEvent.press(screen.getByTestId('sign-out-confirm'));
  expect(signOut).toHaveBeenCalledTimes(1);
});

test('when everything reached the clinic, then sign-out goes at once', () => {
  const signOut = renderWith({ items: 0, recordings: 0, sessions: 0, clients: 0 });
  fireEvent.press(screen.getByTestId('sign-out-button'));
  expect(signOut).toHaveBeenCalledTimes(1);
});

test('when only a new client waits, then the warning names their details', () => {
  expect(unsentWords({ items: 1, recordings: 0, sessions: 0, clients: 1 })).toMatch(
    /^The details of 1 new client have not reached the clinic yet\./,
  );
});
