// The one place that knows how audio gets in and out. On the web target we talk to getUserMedia and Web Audio
// directly: expo-audio's web recorder asks for `audio: true`, which leaves the browser's echo cancellation, noise
// suppression and automatic gain on, and those reshape heart sounds; expo-av has no native build for SDK 55+.
// Playback (playback.ts) goes through expo-audio, the SDK's maintained audio module.
export type RecorderErrorKind =
  'permission-denied' | 'no-microphone' | 'input-missing' | 'unsupported' | 'busy' | 'failed';

export class RecorderError extends Error {
  constructor(
    readonly kind: RecorderErrorKind,
    message: string,
  ) {
    super(message);
    this.name = 'RecorderError';
  }
}

export const recorderMessages: Record<RecorderErrorKind, string> = {
  'permission-denied':
    'Microphone access was refused. Allow the microphone for this site in the browser settings, or import a file instead.',
  'no-microphone': 'No microphone or sensor was found. Connect one and try again, or import a file instead.',
  'input-missing':
    'The chosen input is not connected. Plug the sensor in, or choose another input, then record again.',
  unsupported:
    'This browser cannot record here (recording needs a secure page and a recent browser). Import a file instead.',
  busy: 'The microphone is in use by another app. Close it and try again.',
  failed: 'Recording failed. Try again, or import a file instead.',
};

/** Heart sounds need the raw signal: every voice-call clean-up the browser offers is turned off. */
export const microphoneConstraints: MediaStreamConstraints = {
  audio: { echoCancellation: false, noiseSuppression: false, autoGainControl: false, channelCount: 1 },
  video: false,
};

/** The same, from one chosen input (a digital stethoscope or sensor plugged in), or the default one. */
export function constraintsFor(deviceId: string | null): MediaStreamConstraints {
  if (!deviceId) return microphoneConstraints;
  return {
    ...microphoneConstraints,
    audio: { ...(microphoneConstraints.audio as MediaTrackConstraints), deviceId: { exact: deviceId } },
  };
}

export function recorderErrorFrom(error: unknown, deviceId: string | null = null): RecorderError {
  if (error instanceof RecorderError) return error;
  const name =
    error instanceof Error || (typeof error === 'object' && error && 'name' in error)
      ? String((error as { name: unknown }).name)
      : '';
  if (name === 'NotAllowedError' || name === 'SecurityError' || name === 'PermissionDeniedError') {
    return new RecorderError('permission-denied', recorderMessages['permission-denied']);
  }
  if (name === 'NotFoundError' || name === 'OverconstrainedError' || name === 'DevicesNotFoundError') {
    if (deviceId) return new RecorderError('input-missing', recorderMessages['input-missing']);
    return new RecorderError('no-microphone', recorderMessages['no-microphone']);
  }
  if (name === 'NotReadableError' || name === 'AbortError')
    return new RecorderError('busy', recorderMessages.busy);
  return new RecorderError('failed', recorderMessages.failed);
}

let sharedContext: AudioContext | null = null;

function audioContext(): AudioContext {
  const Ctor =
    globalThis.AudioContext ??
    (globalThis as unknown as { webkitAudioContext?: typeof AudioContext }).webkitAudioContext;
  if (!Ctor) throw new RecorderError('unsupported', recorderMessages.unsupported);
  sharedContext ??= new Ctor();
  return sharedContext;
}

export type Pcm = { samples: Float32Array; sampleRate: number };

export type LiveMicrophone = {
  /** Peak level of the last few milliseconds, 0..1 of full scale. */
  level: () => number;
  start: () => void;
  /** Ends the take and returns it as mono PCM at takeSampleRate. */
  stop: () => Promise<Pcm>;
  close: () => void;
};

/**
 * Takes are captured at 8 kHz: the heart sounds and murmurs we measure lie well below its 4 kHz Nyquist limit,
 * and the analysis then runs on a sixth of the samples of a 48 kHz take.
 */
export const takeSampleRate = 8000;

/** The audio-thread tap (tap-worklet.ts), served from this origin as the Content-Security-Policy requires. */
export const tapWorkletUrl = '/workers/recorder-tap.js';

function join(chunks: Float32Array[]): Float32Array {
  const out = new Float32Array(chunks.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

/**
 * The take is tapped as raw PCM on the audio thread, in an 8 kHz context (the browser resamples the microphone
 * natively). Nothing is left to encode or decode when the take ends, which keeps the time to the trace inside its
 * 300 ms budget, and the signal never passes through a lossy voice codec.
 */
export async function openMicrophone(deviceId: string | null = null): Promise<LiveMicrophone> {
  const media = globalThis.navigator?.mediaDevices;
  const Ctor = globalThis.AudioContext;
  if (!media?.getUserMedia || !Ctor || typeof AudioWorkletNode === 'undefined') {
    throw new RecorderError('unsupported', recorderMessages.unsupported);
  }
  let stream: MediaStream;
  try {
    stream = await media.getUserMedia(constraintsFor(deviceId));
  } catch (error) {
    throw recorderErrorFrom(error, deviceId);
  }
  if (stream.getAudioTracks().length === 0) {
    stream.getTracks().forEach((t) => t.stop());
    throw new RecorderError('no-microphone', recorderMessages['no-microphone']);
  }
  const context = new Ctor({ sampleRate: takeSampleRate });
  const stopAll = () => {
    stream.getTracks().forEach((t) => t.stop());
    void context.close().catch(() => undefined);
  };
  let tap: AudioWorkletNode;
  let source: MediaStreamAudioSourceNode;
  try {
    await context.audioWorklet.addModule(tapWorkletUrl);
    if (context.state === 'suspended') await context.resume();
    source = context.createMediaStreamSource(stream);
    tap = new AudioWorkletNode(context, 'fourpoint-tap', {
      numberOfInputs: 1,
      numberOfOutputs: 1,
      channelCount: 1,
      channelCountMode: 'explicit',
    });
  } catch (error) {
    stopAll();
    throw recorderErrorFrom(error);
  }
  const silent = context.createGain();
  silent.gain.value = 0;
  source.connect(tap);
  tap.connect(silent);
  silent.connect(context.destination);

  const chunks: Float32Array[] = [];
  let recording = false;
  let lastPeak = 0;
  tap.port.onmessage = (event: MessageEvent<Float32Array>) => {
    const block = event.data;
    let peak = 0;
    for (let i = 0; i < block.length; i++) peak = Math.max(peak, Math.abs(block[i] ?? 0));
    lastPeak = peak;
    if (recording) chunks.push(block);
  };

  return {
    level: () => Math.min(1, lastPeak),
    start: () => {
      chunks.length = 0;
      recording = true;
    },
    stop: async () => {
      recording = false;
      return { samples: join(chunks), sampleRate: context.sampleRate };
    },
    close: () => {
      tap.port.onmessage = null;
      source.disconnect();
      stopAll();
    },
  };
}

/** Decodes any compressed format the browser knows into mono PCM. */
export async function decodeWithBrowser(bytes: ArrayBuffer, sampleRate = takeSampleRate): Promise<Pcm> {
  const buffer =
    sampleRate && typeof OfflineAudioContext !== 'undefined'
      ? await new OfflineAudioContext(1, 1, sampleRate).decodeAudioData(bytes.slice(0))
      : await audioContext().decodeAudioData(bytes.slice(0));
  const samples = new Float32Array(buffer.length);
  for (let channel = 0; channel < buffer.numberOfChannels; channel++) {
    const data = buffer.getChannelData(channel);
    for (let i = 0; i < data.length; i++) samples[i]! += data[i]! / buffer.numberOfChannels;
  }
  return { samples, sampleRate: buffer.sampleRate };
}
