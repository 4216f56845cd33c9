import { fireEvent, render, screen } from '@testing-library/react-native';
import { storageFullMessage } from '@/device/local-store/database';
import { SiteStep } from './site-step';
import { useTake, type TakeState } from './use-take';

jest.mock('./use-take', () => ({ ...jest.requireActual('./use-take'), useTake: jest.fn() }));
jest.mock('@/device/recorder/playback', () => ({ playClip: jest.fn() }));
// One input, nothing kept: the picker stays hidden, as on a phone with only its own microphone.
jest.mock('@/device/recorder/inputs', () => ({
  useAudioInputs: () => ({
    inputs: [],
    chosen: null,
    chosenMissing: false,
    choose: jest.fn(),
    refresh: jest.fn(),
  }),
}));

const mockedUseTake = useTake as jest.MockedFunction<typeof useTake>;

function withTake(state: TakeState) {
  const take = { state, record: jest.fn(), stop: jest.fn(), importFile: jest.fn(), reset: jest.fn() };
  mockedUseTake.mockReturnValue(take);
  return take;
}

const done: TakeState = {
  phase: 'done',
  result: {
    source: 'microphone',
    pcm: { samples: new Float32Array(80), sampleRate: 8000 },
    trace: { min: [-0.5, -0.2], max: [0.5, 0.3], durationS: 10 },
    analysis: {
      sampleRate: 8000,
      durationS: 10,
      heartRateBpm: 66,
      sounds: [{ type: 'S1', startS: 1, endS: 1.1, peakAmplitude: 1 }],
      quality: { verdict: 'good', reasons: [] },
      analysisVersion: 't',
      metrics: { irregularRhythm: false },
    } as never,
  },
};

function renderStep(saveError: string | null = null) {
  const onKeep = jest.fn();
  const onSkip = jest.fn();
  render(
    <SiteStep
      site="tricuspid"
      defaultLengthS={15}
      existing={undefined}
      width={360}
      saving={false}
      saveError={saveError}
      onKeep={onKeep}
      onSkip={onSkip}
      onBack={null}
    />,
  );
  return { onKeep, onSkip };
}

test('when the device storage is full while keeping a take, then the take stays on screen with the storage message', () => {
  withTake(done);
  renderStep(storageFullMessage);
  expect(screen.getByTestId('save-error')).toBeTruthy();
  expect(screen.getByText(storageFullMessage)).toBeTruthy();
  expect(screen.getByTestId('trace')).toBeTruthy();
  expect(screen.getByTestId('keep-take')).toBeTruthy();
});

test('when a take is shown, then the cautions are shown beside the result', () => {
  withTake(done);
  renderStep();
  expect(screen.getByTestId('caution-note')).toBeTruthy();
});

test('when a good take is kept, then the screen hands the take and no note to be saved', () => {
  withTake(done);
  const { onKeep } = renderStep();
  fireEvent.press(screen.getByTestId('keep-take'));
  expect(onKeep).toHaveBeenCalledWith(done.phase === 'done' ? done.result : null, null);
});

test('when a site is skipped without a reason, then it asks for one, and with a reason it is skipped', () => {
  withTake({ phase: 'idle' });
  const { onSkip } = renderStep();
  fireEvent.press(screen.getByTestId('skip'));
  fireEvent.press(screen.getByTestId('skip-confirm'));
  expect(screen.getByTestId('skip-error')).toBeTruthy();
  expect(onSkip).not.toHaveBeenCalled();
  fireEvent.press(screen.getByTestId('skip-reason-0'));
  fireEvent.press(screen.getByTestId('skip-confirm'));
  expect(onSkip).toHaveBeenCalledWith('Client declined this site');
});

test('when the microphone was refused, then the message is shown with the import still offered', () => {
  withTake({ phase: 'error', kind: 'permission-denied', message: 'Microphone access was refused.' });
  renderStep();
  expect(screen.getByTestId('take-error-permission-denied')).toBeTruthy();
  expect(screen.getByTestId('import')).toBeTruthy();
});

test('when the operator picks another length, then the record button uses it', () => {
  withTake({ phase: 'idle' });
  renderStep();
  fireEvent.press(screen.getByTestId('length-30'));
  expect(mockedUseTake).toHaveBeenLastCalledWith('tricuspid', 30, null, expect.any(Function));
});

test('when a length was chosen at one site, then the next site and the next visit start with it', async () => {
  withTake({ phase: 'idle' });
  renderStep();
  fireEvent.press(screen.getByTestId('length-20'));
  screen.unmount();
  renderStep();
  expect(await screen.findByText('Record 20 s')).toBeTruthy();
  expect(mockedUseTake).toHaveBeenLastCalledWith('tricuspid', 20, null, expect.any(Function));
});
