import { fireEvent, render, screen } from '@testing-library/react-native';
import { Platform } from 'react-native';
import { DateField } from './date-field';

// The calendar is the web target's (react-day-picker renders DOM elements); component tests run as the web
// platform for it. Day cells are named by the library's own accessible labels.
describe('DateField', () => {
  const original = Platform.OS;
  beforeAll(() => {
    Platform.OS = 'web';
  });
  afterAll(() => {
    Platform.OS = original;
  });

  test('when a day is typed, then it is repeated in words under the box', () => {
    render(<DateField label="Follow-up date" testID="d" value="2027-01-20" onChange={() => {}} />);
    expect(screen.getByTestId('d-in-words')).toHaveTextContent(/2027/);
  });

  test('when the box is cleared, then nothing is repeated', () => {
    render(<DateField label="Follow-up date" testID="d" value="" onChange={() => {}} />);
    expect(screen.queryByTestId('d-in-words')).toBeNull();
  });

  test('when typing, then the typed text goes out as it is', () => {
    const onChange = jest.fn();
    render(<DateField label="Follow-up date" testID="d" value="" onChange={onChange} />);
    fireEvent.changeText(screen.getByTestId('d'), '2027-01-2');
    expect(onChange).toHaveBeenCalledWith('2027-01-2');
  });

  test('when the field is read-only, then there is no calendar to open', () => {
    render(<DateField label="Follow-up date" testID="d" value="" onChange={() => {}} editable={false} />);
    expect(screen.queryByTestId('d-calendar-toggle')).toBeNull();
  });
});
