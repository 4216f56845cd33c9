import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, within } from '@testing-library/react-native';
import type { ReactNode } from 'react';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { request } from '@/api/client';
import { AuthContext, type AuthContextValue } from '@/features/auth/auth-context';
import { FollowUpsScreen } from './follow-ups-screen';

jest.mock('@/api/client', () => ({ request: jest.fn() }));
const mockPush = jest.fn();
jest.mock('expo-router', () => ({ useRouter: () => ({ push: mockPush }) }));
const mockedRequest = request as jest.MockedFunction<typeof request>;

const soon = {
  clientId: '11111111-1111-4111-8111-111111111111',
  clientName: 'Ada Fernsby',
  followUpDate: '2026-12-09',
  daysUntil: 7,
  lastVisit: '2026-10-01',
  reminderStatus: 'sent' as const,
};
const overdue = {
  clientId: '22222222-2222-4222-8222-222222222222',
  clientName: 'Bram Oakhollow-Featherstonehaugh-Winterbourne',
  followUpDate: '2026-11-29',
  daysUntil: -3,
  lastVisit: '2026-09-12',
  reminderStatus: 'failed' as const,
};

function renderScreen(children: ReactNode) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const signedOut: AuthContextValue = {
    status: 'signed-out',
    user: null,
    signIn: jest.fn(),
    signOut: jest.fn(),
  };
  const metrics = {
    frame: { x: 0, y: 0, width: 390, height: 844 },
    insets: { top: 0, left: 0, right: 0, bottom: 0 },
  };
  return render(
    <SafeAreaProvider initialMetrics={metrics}>
      <AuthContext.Provider value={signedOut}>
        <QueryClientProvider client={client}>{children}</QueryClientProvider>
      </AuthContext.Provider>
    </SafeAreaProvider>,
  );
}

beforeEach(() => {
  mockedRequest.mockReset();
  mockPush.mockReset();
});

test('when follow-ups are due, then the overdue one comes first, each says when in words, and a row opens the client with Back to this list', async () => {
  mockedRequest.mockResolvedValue({ kind: 'ok', data: { due: [soon, overdue] } });
  renderScreen(<FollowUpsScreen />);
  const table = await screen.findByTestId('follow-ups-table');
  const names = within(table)
    .getAllByTestId(/^follow-ups-name-/)
    .map((n) => n.props.children);
  expect(names).toEqual([overdue.clientName, soon.clientName]);
  expect(screen.getByTestId(`follow-ups-due-${overdue.clientId}`)).toHaveTextContent('3 days overdue');
  expect(screen.getByTestId(`follow-ups-due-${soon.clientId}`)).toHaveTextContent('In 7 days');
  expect(screen.getByText('Reminder not delivered')).toBeTruthy();
  // The long name is kept whole for a screen reader and a pointer's hover, and cut to two lines on screen.
  const longName = screen.getByTestId(`follow-ups-name-${overdue.clientId}`);
  expect(longName.props.numberOfLines).toBe(2);
  expect(longName.props.accessibilityLabel).toBe(overdue.clientName);
  fireEvent.press(screen.getByTestId(`follow-ups-row-${overdue.clientId}`));
  expect(mockPush).toHaveBeenCalledWith({
    pathname: '/review-clients/[clientId]',
    params: { clientId: overdue.clientId, from: 'follow-ups' },
  });
});

test('when a longer period is chosen, then the list is asked for again over that many days', async () => {
  mockedRequest.mockResolvedValue({ kind: 'ok', data: { due: [] } });
  renderScreen(<FollowUpsScreen />);
  await screen.findByTestId('follow-ups-empty');
  fireEvent.press(screen.getByTestId('follow-ups-window-90'));
  await screen.findByTestId('follow-ups-empty');
  expect(mockedRequest.mock.calls.map((c) => (c[0] as { params: unknown }).params)).toEqual([
    { withinDays: 14 },
    { withinDays: 90 },
  ]);
});
