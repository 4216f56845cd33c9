import { act, renderHook } from '@testing-library/react-native';
import { pickAudioFile, ImportError } from '@/device/recorder/import-file';
import { analyseInWorker } from '@/device/analysis-worker/analyse-in-worker';
import { openMicrophone, RecorderError, recorderMessages } from '@/device/recorder/recorder';
import { minimumTakeS, useTake } from './use-take';

jest.mock('@/device/analysis-worker/analyse-in-worker', () => ({
  analyseInWorker: jest.fn(),
  warmAnalysisWorker: jest.fn(),
}));
jest.mock('@/device/recorder/import-file', () => {
  const actual = jest.requireActual('@/device/recorder/import-file');
  return { ...actual, pickAudioFile: jest.fn() };
});
jest.mock('@/device/recorder/recorder', () => {
  const actual = jest.requireActual('@/device/recorder/recorder');
  return { ...actual, openMicrophone: jest.fn() };
});

const picked = pickAudioFile as jest.MockedFunction<typeof pickAudioFile>;
const analyse = analyseInWorker as jest.MockedFunction<typeof analyseInWorker>;
const open = openMicrophone as jest.MockedFunction<typeof openMicrophone>;

beforeEach(() => jest.clearAllMocks());

test('when the imported clip is shorter than the minimum, then the take is refused as too short and not analysed', async () => {
  const rate = 4000;
  picked.mockResolvedValue({
    samples: new Float32Array(rate * (minimumTakeS / 2)),
    sampleRate: rate,
    name: 'short.wav',
    bytes: new Uint8Array(),
  });
  const { result } = renderHook(() => useTake('mitral', 15));
  await act(() => result.current.importFile());
  expect(result.current.state).toMatchObject({ phase: 'error', kind: 'too-short' });
  expect(result.current.state.phase === 'error' && result.current.state.message).toMatch(/lasts 0\.5 s/);
  expect(analyse).not.toHaveBeenCalled();
});

test('when the import cannot be read, then its message is shown and the operator can try again', async () => {
  picked.mockRejectedValue(
    new ImportError('“x.wav” could not be read: it holds no sound. Choose another file.'),
  );
  const { result } = renderHook(() => useTake('aortic', 15));
  await act(() => result.current.importFile());
  expect(result.current.state).toMatchObject({
    phase: 'error',
    kind: 'import',
    message: expect.stringContaining('could not be read'),
  });
  act(() => result.current.reset());
  expect(result.current.state).toEqual({ phase: 'idle' });
});

test('when the operator cancels the file picker, then nothing changes', async () => {
  picked.mockResolvedValue(null);
  const { result } = renderHook(() => useTake('aortic', 15));
  await act(() => result.current.importFile());
  expect(result.current.state).toEqual({ phase: 'idle' });
});

test('when the microphone is refused, then the take shows the permission message', async () => {
  open.mockRejectedValue(new RecorderError('permission-denied', recorderMessages['permission-denied']));
  const { result } = renderHook(() => useTake('tricuspid', 15));
  await act(() => result.current.record());
  expect(result.current.state).toMatchObject({
    phase: 'error',
    kind: 'permission-denied',
    message: recorderMessages['permission-denied'],
  });
});

test('when there is no microphone, then the take says so', async () => {
  open.mockRejectedValue(new RecorderError('no-microphone', recorderMessages['no-microphone']));
  const { result } = renderHook(() => useTake('tricuspid', 15));
  await act(() => result.current.record());
  expect(result.current.state).toMatchObject({ phase: 'error', kind: 'no-microphone' });
});

test('when a long enough import is analysed, then the result carries the analysis and the trace', async () => {
  const rate = 4000;
  const samples = new Float32Array(rate * 12);
  picked.mockResolvedValue({ samples, sampleRate: rate, name: 'ok.wav', bytes: new Uint8Array() });
  const analysis = { heartRateBpm: 70, quality: { verdict: 'good', reasons: [] }, sounds: [] } as never;
  analyse.mockResolvedValue({
    id: 1,
    ok: true,
    analysis,
    trace: { min: [0], max: [0], durationS: 12 },
    workerMs: 5,
  });
  const { result } = renderHook(() => useTake('pulmonic', 15));
  await act(() => result.current.importFile());
  expect(analyse).toHaveBeenCalledWith(samples, rate, 'pulmonic');
  expect(result.current.state).toMatchObject({ phase: 'done', result: { source: 'import', analysis } });
});
