import {
  microphoneConstraints,
  openMicrophone,
  RecorderError,
  recorderErrorFrom,
  recorderMessages,
} from './recorder';

type Globals = { navigator?: unknown; AudioContext?: unknown; AudioWorkletNode?: unknown };
const g = globalThis as unknown as Globals;
const saved = { navigator: g.navigator, AudioContext: g.AudioContext, AudioWorkletNode: g.AudioWorkletNode };

function domError(name: string): Error {
  const error = new Error(`${name} raised by the browser`);
  error.name = name;
  return error;
}

function withMicrophone(getUserMedia: jest.Mock) {
  Object.defineProperty(globalThis, 'navigator', {
    value: { mediaDevices: { getUserMedia } },
    configurable: true,
    writable: true,
  });
  g.AudioContext = jest.fn();
  g.AudioWorkletNode = jest.fn();
}

afterEach(() => {
  Object.defineProperty(globalThis, 'navigator', {
    value: saved.navigator,
    configurable: true,
    writable: true,
  });
  g.AudioContext = saved.AudioContext;
  g.AudioWorkletNode = saved.AudioWorkletNode;
});

describe('openMicrophone', () => {
  test('when the operator refuses the microphone, then the error says so and points to importing a file', async () => {
    withMicrophone(jest.fn().mockRejectedValue(domError('NotAllowedError')));
    const failure = await openMicrophone().catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(RecorderError);
    expect((failure as RecorderError).kind).toBe('permission-denied');
    expect((failure as RecorderError).message).toBe(recorderMessages['permission-denied']);
  });

  test('when the device has no microphone, then the error says none was found', async () => {
    withMicrophone(jest.fn().mockRejectedValue(domError('NotFoundError')));
    await expect(openMicrophone()).rejects.toMatchObject({ kind: 'no-microphone' });
  });

  test('when the browser hands back a stream without an audio track, then it counts as no microphone and the stream is released', async () => {
    const stop = jest.fn();
    withMicrophone(jest.fn().mockResolvedValue({ getAudioTracks: () => [], getTracks: () => [{ stop }] }));
    await expect(openMicrophone()).rejects.toMatchObject({ kind: 'no-microphone' });
    expect(stop).toHaveBeenCalled();
  });

  test('when the microphone is held by another app, then the error says it is busy', async () => {
    withMicrophone(jest.fn().mockRejectedValue(domError('NotReadableError')));
    await expect(openMicrophone()).rejects.toMatchObject({ kind: 'busy' });
  });

  test('when the page has no media devices (not a secure page), then recording is reported unsupported', async () => {
    Object.defineProperty(globalThis, 'navigator', { value: {}, configurable: true, writable: true });
    await expect(openMicrophone()).rejects.toMatchObject({ kind: 'unsupported' });
  });

  test('when the microphone is asked for, then echo cancellation, noise suppression and gain control are off', async () => {
    const getUserMedia = jest.fn().mockRejectedValue(domError('NotAllowedError'));
    withMicrophone(getUserMedia);
    await openMicrophone().catch(() => undefined);
    expect(getUserMedia).toHaveBeenCalledWith(microphoneConstraints);
    expect(microphoneConstraints.audio).toMatchObject({
      echoCancellation: false,
      noiseSuppression: false,
      autoGainControl: false,
    });
  });
});

describe('recording from a chosen input', () => {
  test('when an input is chosen, then only that one is asked for, with the same raw-signal settings', async () => {
    const getUserMedia = jest.fn().mockRejectedValue(domError('NotAllowedError'));
    withMicrophone(getUserMedia);
    await openMicrophone('stethoscope-usb-1').catch(() => undefined);
    expect(getUserMedia).toHaveBeenCalledWith({
      video: false,
      audio: { ...(microphoneConstraints.audio as object), deviceId: { exact: 'stethoscope-usb-1' } },
    });
  });

  test('when the chosen input is unplugged, then the error says so rather than that the device has none', async () => {
    withMicrophone(jest.fn().mockRejectedValue(domError('OverconstrainedError')));
    const failure = await openMicrophone('stethoscope-usb-1').catch((e: unknown) => e);
    expect(failure).toMatchObject({ kind: 'input-missing', message: recorderMessages['input-missing'] });
  });
});

test('when an unknown error comes from the browser, then it maps to a generic failure with a way forward', () => {
  expect(recorderErrorFrom(new Error('boom'))).toMatchObject({
    kind: 'failed',
    message: recorderMessages.failed,
  });
});
