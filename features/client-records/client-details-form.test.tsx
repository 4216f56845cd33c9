import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { ApiFailure } from '@/api/result';
import { httpFailure } from '@/shared/http-failure';
import type { ClientRecord } from '@/shared/protocol/practice';
import { ClientDetailsForm } from './client-details-form';

// An invented client record at version 3.
const record = (version: number, notes: string): ClientRecord => ({
  client: {
    id: '5b7d9e1f-2a4c-4e6f-8a0b-1c3d5e7f9a2b',
    firstName: 'Tamsin',
    lastName: 'Ellery',
    dateOfBirth: '1990-02-11',
    email: 'tamsin.ellery@example.test',
    phone: null,
    lastVisit: null,
    visits: 0,
    hasConsent: true,
    nextFollowUp: null,
    keepUntil: '2032-10-07',
    retentionDue: false,
    notes,
    version,
    createdAt: '2026-11-02T09:00:00.000Z',
  },
  visits: [],
  consents: [],
  packages: [],
});
const stale = () =>
  new ApiFailure(
    httpFailure(409, {
      error: { code: 'stale_version', message: 'This record was changed by someone else.' },
    }),
  );

describe('client details form', () => {
  test('when a save meets a newer version, then the stale message shows, the edit stays, and "save mine" retries on the latest version', async () => {
    const onSave = jest
      .fn()
      .mockRejectedValueOnce(stale())
      .mockImplementationOnce(async (input: { notes: string }) => record(5, input.notes));
    const onReload = jest.fn(async () => record(4, 'Their note'));
    render(<ClientDetailsForm client={record(3, 'Old note').client} onSave={onSave} onReload={onReload} />);
    fireEvent.changeText(screen.getByTestId('client-field-notes'), 'My note');
    fireEvent.press(screen.getByTestId('client-save'));
    expect(await screen.findByTestId('client-stale')).toHaveTextContent(/Nothing was saved/);
    expect(onSave).toHaveBeenLastCalledWith(expect.objectContaining({ notes: 'My note', version: 3 }));
    expect(screen.getByTestId('client-field-notes').props.value).toBe('My note');

    fireEvent.press(screen.getByTestId('client-stale-keep'));
    await waitFor(() =>
      expect(onSave).toHaveBeenLastCalledWith(expect.objectContaining({ notes: 'My note', version: 4 })),
    );
    expect(await screen.findByTestId('client-save-ok')).toBeTruthy();
    expect(screen.queryByTestId('client-stale')).toBeNull();
  });

  test('when the stale edit is discarded, then the latest version fills the form', async () => {
    const onSave = jest.fn().mockRejectedValueOnce(stale());
    const onReload = jest.fn(async () => record(4, 'Their note'));
    render(<ClientDetailsForm client={record(3, 'Old note').client} onSave={onSave} onReload={onReload} />);
    fireEvent.changeText(screen.getByTestId('client-field-notes'), 'My note');
    fireEvent.press(screen.getByTestId('client-save'));
    await screen.findByTestId('client-stale');
    fireEvent.press(screen.getByTestId('client-stale-reload'));
    await waitFor(() => expect(screen.getByTestId('client-field-notes').props.value).toBe('Their note'));
    expect(onSave).toHaveBeenCalledTimes(1);
  });

  test('when the date of birth is not a real date, then that field says so and nothing is saved', async () => {
    const onSave = jest.fn();
    render(<ClientDetailsForm client={record(3, '').client} onSave={onSave} onReload={jest.fn()} />);
    fireEvent.changeText(screen.getByTestId('client-field-dateOfBirth'), '1990-02-30');
    fireEvent.changeText(screen.getByTestId('client-field-email'), 'not-an-address');
    fireEvent.press(screen.getByTestId('client-save'));
    expect(await screen.findByTestId('client-field-dateOfBirth-error')).toHaveTextContent(/real date/);
    expect(await screen.findByTestId('client-field-email-error')).toHaveTextContent(
      'Enter a valid e-mail address.',
    );
    expect(onSave).not.toHaveBeenCalled();
  });
});
