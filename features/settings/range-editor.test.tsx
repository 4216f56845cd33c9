import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import type { ClinicRange } from '@/shared/protocol/practice';
import { RangeEditor } from './range-editor';

// Adult resting heart rate 60–100 bpm (the default in shared/ranges; common practice, from memory). The tests
// check the editor's own rules: numbers or blank, low not above high, nothing sent when invalid.
const heartRate = (
  site: ClinicRange['site'],
  low: number | null = 60,
  high: number | null = 100,
): ClinicRange => ({
  metric: 'heartRateBpm',
  label: 'Heart rate',
  unit: 'bpm',
  site,
  low,
  high,
  defaultLow: 60,
  defaultHigh: 100,
  source: 'Adult resting rate of 60–100 bpm (from memory).',
  overridden: low !== 60 || high !== 100,
});

function setup(ranges: ClinicRange[] = [heartRate('mitral'), heartRate('aortic')]) {
  const onSave = jest.fn(async () => ranges);
  const onReset = jest.fn(async () => ranges);
  render(<RangeEditor ranges={ranges} onSave={onSave} onReset={onReset} />);
  return { onSave, onReset };
}

const id = 'heartRateBpm-mitral';
const type = (side: 'low' | 'high', text: string) =>
  fireEvent.changeText(screen.getByTestId(`range-${side}-${id}`), text);
const save = () => fireEvent.press(screen.getByTestId(`range-save-${id}`));

describe('reference range editor', () => {
  test('when the low end is above the high end, then the high field says so and nothing is saved', async () => {
    const { onSave } = setup();
    type('low', '110');
    save();
    expect(await screen.findByTestId(`range-high-${id}-error`)).toHaveTextContent(
      'The low end must not be above the high end.',
    );
    expect(onSave).not.toHaveBeenCalled();
  });

  test('when a limit is not a number, then that field asks for one and nothing is saved', async () => {
    const { onSave } = setup();
    type('high', '9O');
    save();
    expect(await screen.findByTestId(`range-high-${id}-error`)).toHaveTextContent(/Enter a number/);
    expect(screen.queryByTestId(`range-low-${id}-error`)).toBeNull();
    expect(onSave).not.toHaveBeenCalled();
  });

  test('when valid limits are entered, then they are saved as numbers for that metric and site', async () => {
    const { onSave } = setup();
    type('low', '55');
    type('high', '95.5');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    expect(onSave).toHaveBeenCalledWith(expect.objectContaining({ metric: 'heartRateBpm', site: 'mitral' }), {
      low: 55,
      high: 95.5,
    });
  });

  test('when a limit is left blank, then it is saved as no limit on that side', async () => {
    const { onSave } = setup();
    type('low', ' ');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledWith(expect.anything(), { low: null, high: 100 }));
  });

  test('when a range is the clinic’s own, then it can be reset and shows its default and source', async () => {
    const { onReset } = setup([heartRate('mitral', 50, 90)]);
    expect(screen.getByTestId(`range-own-${id}`)).toBeTruthy();
    expect(screen.getByText(/Default 60–100 bpm\. Adult resting rate/)).toBeTruthy();
    fireEvent.press(screen.getByTestId(`range-reset-${id}`));
    await waitFor(() => expect(onReset).toHaveBeenCalledWith(expect.objectContaining({ site: 'mitral' })));
  });

  test('when the server refuses a save, then its message shows beside the range', async () => {
    const onSave = jest.fn(async () => {
      throw new Error('There is no range for heartRateBpm at mitral.');
    });
    render(<RangeEditor ranges={[heartRate('mitral')]} onSave={onSave} onReset={jest.fn()} />);
    type('high', '120');
    save();
    expect(await screen.findByTestId(`range-error-${id}`)).toHaveTextContent(
      'There is no range for heartRateBpm at mitral.',
    );
  });

  test('when another site is picked, then only that site’s ranges show', () => {
    setup();
    expect(screen.getByTestId('range-heartRateBpm-mitral')).toBeTruthy();
    expect(screen.queryByTestId('range-heartRateBpm-aortic')).toBeNull();
    fireEvent.press(screen.getByTestId('range-site-aortic'));
    expect(screen.getByTestId('range-heartRateBpm-aortic')).toBeTruthy();
    expect(screen.queryByTestId('range-heartRateBpm-mitral')).toBeNull();
  });
});
