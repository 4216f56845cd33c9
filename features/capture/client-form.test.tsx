import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { ClientForm } from './client-form';
import { toShownConsentText } from '@/device/consent/clinic-consent-text';
import { formatDate } from '@/ui/format';
import { ConsentForm } from './consent-form';
import { fillFields, submitExpectingErrors } from '@/tests/support/form-fields';

describe('ClientForm', () => {
  test('when submitted empty, then each required field says what is missing and nothing is saved', async () => {
    const onSubmit = jest.fn();
    render(<ClientForm onSubmit={onSubmit} />);
    await submitExpectingErrors('client', 'client-submit', {
      firstName: 'Enter the first name.',
      lastName: 'Enter the last name.',
    });
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when the date of birth is not a real date, then the field says so', async () => {
    const onSubmit = jest.fn();
    render(<ClientForm onSubmit={onSubmit} />);
    fillFields('client', {
      firstName: 'Ilse',
      lastName: 'Vantongeren',
      dateOfBirth: '1990-02-31',
      email: 'not-an-email',
    });
    await submitExpectingErrors('client', 'client-submit', {
      dateOfBirth: 'Choose a day in the past on the calendar, or type it as YYYY-MM-DD.',
      email: 'Enter an e-mail address like name@example.com, or leave it empty.',
    });
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when the fields are valid, then the values are handed over', async () => {
    const onSubmit = jest.fn().mockResolvedValue(undefined);
    render(<ClientForm onSubmit={onSubmit} />);
    fillFields('client', { firstName: 'Ilse', lastName: 'Vantongeren', dateOfBirth: '1990-02-28' });
    fireEvent.press(screen.getByTestId('client-submit'));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toMatchObject({
      firstName: 'Ilse',
      lastName: 'Vantongeren',
      dateOfBirth: '1990-02-28',
    });
  });
});

describe('ConsentForm', () => {
  test('when the typed name differs from the client on file, then consent is refused with the expected name', async () => {
    const onSubmit = jest.fn();
    render(<ConsentForm clientName="Ilse Vantongeren" text={toShownConsentText(null)} onSubmit={onSubmit} />);
    fireEvent.changeText(screen.getByTestId('consent-name'), 'Somebody Else');
    fireEvent.press(screen.getByTestId('consent-submit'));
    expect(await screen.findByTestId('consent-name-error')).toHaveTextContent(
      'Type the name exactly as on file: Ilse Vantongeren.',
    );
    expect(onSubmit).not.toHaveBeenCalled();
  });

  test('when the client types their name (any case and spacing), then consent is stored with the text version', async () => {
    const onSubmit = jest.fn().mockResolvedValue(undefined);
    render(<ConsentForm clientName="Ilse Vantongeren" text={toShownConsentText(null)} onSubmit={onSubmit} />);
    fireEvent.changeText(screen.getByTestId('consent-name'), '  ilse   vantongeren ');
    fireEvent.press(screen.getByTestId('consent-submit'));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ textVersion: '1' });
    expect(onSubmit.mock.calls[0][0].signedOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
  });

  test('when consent is taken, then it is dated today, shown as such and not typed', async () => {
    const onSubmit = jest.fn().mockResolvedValue(undefined);
    render(<ConsentForm clientName="Ilse Vantongeren" text={toShownConsentText(null)} onSubmit={onSubmit} />);
    const now = new Date();
    const pad = (n: number) => String(n).padStart(2, '0');
    const today = `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
    expect(screen.getByTestId('consent-date')).toHaveTextContent(`Today, ${formatDate(today)}`);
    fireEvent.changeText(screen.getByTestId('consent-name'), 'Ilse Vantongeren');
    fireEvent.press(screen.getByTestId('consent-submit'));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0].signedOn).toBe(today);
  });
});
