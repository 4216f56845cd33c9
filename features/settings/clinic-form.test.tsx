import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import type { ClinicSettings } from '@/shared/protocol/practice';
import { fillFields, submitExpectingErrors } from '@/tests/support/form-fields';
import { ClinicForm } from './clinic-form';

const settings: ClinicSettings = {
  name: 'Harbourview Test Clinic',
  address: '12 Invented Lane',
  logoDataUrl: null,
  retentionMonths: 120,
  reminderDaysBefore: 3,
  currency: 'usd',
  offers: [],
};

describe('ClinicForm', () => {
  test('when the months and days are out of range, then each field says its allowed range and nothing is saved', async () => {
    const onSave = jest.fn().mockResolvedValue(undefined);
    render(<ClinicForm settings={settings} onSave={onSave} />);
    fillFields('settings', { retentionMonths: '0', reminderDaysBefore: '61' });
    await submitExpectingErrors('settings', 'settings-save', {
      retentionMonths: 'Months: a whole number from 1 to 600.',
      reminderDaysBefore: 'Days: a whole number from 0 to 60.',
    });
    expect(onSave).not.toHaveBeenCalled();
  });

  test('when the clinic name is emptied, then the name field asks for it', async () => {
    const onSave = jest.fn().mockResolvedValue(undefined);
    render(<ClinicForm settings={settings} onSave={onSave} />);
    fillFields('settings', { name: '   ' });
    await submitExpectingErrors('settings', 'settings-save', { name: 'Clinic name is required.' });
    expect(onSave).not.toHaveBeenCalled();
  });

  test('when valid values are saved, then numbers go out as numbers and an empty address as null', async () => {
    const onSave = jest.fn().mockResolvedValue(undefined);
    render(<ClinicForm settings={settings} onSave={onSave} />);
    fillFields('settings', { address: '', retentionMonths: '84' });
    fireEvent.press(screen.getByTestId('settings-save'));
    await waitFor(() =>
      expect(onSave).toHaveBeenCalledWith({
        ...settings,
        address: null,
        retentionMonths: 84,
        timeZone: 'UTC',
      }),
    );
    expect(await screen.findByTestId('settings-save-ok')).toHaveTextContent('Saved.');
  });
});
