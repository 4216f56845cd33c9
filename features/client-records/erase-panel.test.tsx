import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import type { EraseClientResponse } from '@/shared/protocol/practice';
import { ErasePanel, ErasureResult } from './erase-panel';

// An invented client; the rule under test is ours: nothing is sent until the typed name matches.
const fullName = 'Oriel Fairweather';
const erased: EraseClientResponse = {
  erasureId: '0f6c2a9e-4b1d-4e7a-9c3f-2d8b1a7e6c55',
  clientName: fullName,
  erased: { visits: 6, recordings: 24, consents: 1, reportEmails: 3 },
  rowsTombstoned: 9,
  blobsDeleted: 4,
};

function setup(onErase = jest.fn(async () => erased)) {
  const onDone = jest.fn();
  render(<ErasePanel fullName={fullName} onErase={onErase} onDone={onDone} />);
  fireEvent.press(screen.getByTestId('erase-start'));
  return { onErase, onDone };
}

function confirmWith(typed: string) {
  fireEvent.changeText(screen.getByTestId('erase-confirm-name'), typed);
  fireEvent.press(screen.getByTestId('erase-submit'));
}

describe('erase confirmation', () => {
  test('when nothing is typed, then the field asks for the name and nothing is erased', async () => {
    const { onErase, onDone } = setup();
    confirmWith('');
    expect(await screen.findByTestId('erase-confirm-name-error')).toHaveTextContent(
      'Type “Oriel Fairweather” to confirm.',
    );
    expect(onErase).not.toHaveBeenCalled();
    expect(onDone).not.toHaveBeenCalled();
  });

  test('when another name is typed, then the field says it does not match and nothing is erased', async () => {
    const { onErase } = setup();
    confirmWith('Oriel Fairweathers');
    expect(await screen.findByTestId('erase-confirm-name-error')).toHaveTextContent(/does not match/);
    expect(onErase).not.toHaveBeenCalled();
  });

  test('when the name is typed with other case and spacing, then the erasure is sent and its result handed on', async () => {
    const { onErase, onDone } = setup();
    confirmWith('  oriel   FAIRWEATHER ');
    await waitFor(() => expect(onDone).toHaveBeenCalledWith(erased));
    expect(onErase).toHaveBeenCalledWith('oriel   FAIRWEATHER');
    expect(screen.queryByTestId('erase-confirm-name-error')).toBeNull();
  });

  test('when the server refuses the erasure, then its message is shown and the panel stays open', async () => {
    const { onDone } = setup(
      jest.fn(async () => {
        throw new Error("The typed name does not match the client's name; nothing was erased.");
      }),
    );
    confirmWith(fullName);
    expect(await screen.findByTestId('erase-error')).toHaveTextContent(/nothing was erased/);
    expect(onDone).not.toHaveBeenCalled();
    expect(screen.getByTestId('erase-confirm-name')).toBeTruthy();
  });

  test('when cancelled, then the typed name is cleared and the panel closes', async () => {
    const { onErase } = setup();
    fireEvent.changeText(screen.getByTestId('erase-confirm-name'), fullName);
    fireEvent.press(screen.getByTestId('erase-cancel'));
    expect(await screen.findByTestId('erase-start')).toBeTruthy();
    fireEvent.press(screen.getByTestId('erase-start'));
    expect(screen.getByTestId('erase-confirm-name').props.value).toBe('');
    expect(onErase).not.toHaveBeenCalled();
  });

  test('when the erasure is done, then the result counts visits, recordings, consents and report e-mails in words', () => {
    render(<ErasureResult result={erased} onBack={jest.fn()} />);
    expect(screen.getByTestId('erase-result-counts')).toHaveTextContent(
      'Erased Oriel Fairweather: 6 visits, 24 recordings, 1 signed consent and 3 report e-mails.',
    );
    expect(screen.queryByText(/row|clip file|[0-9a-f]{8}/)).toBeNull();
  });

  test('when a client had no visits, then the result says only the record went', () => {
    render(
      <ErasureResult
        result={{ ...erased, erased: { visits: 0, recordings: 0, consents: 0, reportEmails: 0 } }}
        onBack={jest.fn()}
      />,
    );
    expect(screen.getByTestId('erase-result-counts')).toHaveTextContent(
      'Erased Oriel Fairweather: the record only (no visits yet).',
    );
  });
});
