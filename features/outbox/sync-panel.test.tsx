import { fireEvent, render, screen } from '@testing-library/react-native';
import { useOutboxCount } from '@/device/local-store/queries';
import { OUTDATED_CLIENT_MESSAGE } from '@/shared/protocol/sync';
import { DeviceSyncContext, type DeviceSyncState } from '@/device/sync/sync-context';
import { SyncPanel } from './sync-panel';

jest.mock('@/device/local-store/queries', () => ({ useOutboxCount: jest.fn() }));
const mockedCount = useOutboxCount as jest.MockedFunction<typeof useOutboxCount>;

function renderWith(state: Partial<DeviceSyncState>, pending = 0) {
  mockedCount.mockReturnValue({ data: pending } as never);
  const value: DeviceSyncState = {
    ready: true,
    running: false,
    online: true,
    syncNow: jest.fn(() => Promise.resolve(null)),
    ...state,
  };
  render(
    <DeviceSyncContext.Provider value={value}>
      <SyncPanel />
    </DeviceSyncContext.Provider>,
  );
  return value;
}

test('when the server refused the app version, then its message is shown to the operator', () => {
  renderWith({ outdated: OUTDATED_CLIENT_MESSAGE }, 3);
  expect(screen.getByTestId('sync-outdated')).toBeTruthy();
  expect(screen.getByText(OUTDATED_CLIENT_MESSAGE)).toBeTruthy();
});

test('when the device is offline with items queued, then it says so rather than "sending"', () => {
  renderWith({ online: false, running: true }, 4);
  expect(screen.getByTestId('sync-status').props.children).toMatch(/^Offline/);
});

test('when a run failed for a passing reason, then the reason is shown and retrying is promised', () => {
  renderWith({ lastError: 'The clinic server cannot be reached.' }, 2);
  expect(screen.getByTestId('sync-status').props.children).toBe(
    'Not sent yet: The clinic server cannot be reached. Retrying on its own.',
  );
});

test('when everything is sent, then it reads up to date, and "Sync now" asks the engine to drain', () => {
  const state = renderWith({ lastRunAt: Date.UTC(2026, 11, 2, 9, 30, 5) }, 0);
  expect(screen.getByTestId('sync-status').props.children).toBe('Up to date with the clinic.');
  fireEvent.press(screen.getByTestId('sync-now'));
  expect(state.syncNow).toHaveBeenCalledTimes(1);
});

test('when some items are still queued without an error, then it does not claim to be up to date', () => {
  renderWith({}, 1);
  expect(screen.getByTestId('sync-status').props.children).toBe(
    '1 item not sent yet; each one below says why.',
  );
});
