import { fireEvent, render, screen, within } from '@testing-library/react-native';
import type { OutboxRow } from '@/device/local-store/records';
import { OutboxList } from './outbox-list';

let n = 0;
function item(patch: Partial<OutboxRow>): OutboxRow {
  n++;
  return {
    id: `i${n}`,
    kind: 'clip',
    rowId: `r${n}`,
    sizeBytes: 48_000,
    state: 'sent',
    attempts: 1,
    nextAttemptAt: 0,
    progress: 1,
    createdAt: 1_764_670_000_000 + n,
    label: null,
    clientId: 'c1',
    sessionId: 's1',
    clientName: 'Maren Okonkwo-Lind',
    site: 'mitral',
    ...patch,
  };
}

test('when a session waits, then it reads in plain words with the client’s name, and sizes show only in Details', () => {
  render(
    <OutboxList
      items={[
        item({}),
        item({ site: 'aortic' }),
        item({ site: 'pulmonic' }),
        item({ site: 'tricuspid', state: 'failed', progress: 0, lastError: 'clip_refused: not sealed' }),
      ]}
    />,
  );
  const group = screen.getByTestId('outbox-group-s1');
  expect(within(group).getByTestId('outbox-group-name')).toHaveTextContent('Maren Okonkwo-Lind');
  expect(within(group).getByTestId('outbox-group-progress')).toHaveTextContent('3 of 4 recordings sent');
  expect(within(group).getByTestId('outbox-refused-help')).toHaveTextContent(
    /show the reason to your clinic’s admin/,
  );
  expect(within(group).queryByTestId('outbox-size')).toBeNull();
  expect(screen.queryByText(/clip_refused/)).toBeNull();
  fireEvent.press(within(group).getByTestId('outbox-details-toggle'));
  expect(within(group).getAllByTestId('outbox-size')[0]).toHaveTextContent(/46\.9 KB · 1 attempt/);
  expect(screen.getByText(/clip_refused: not sealed/)).toBeTruthy();
});
