// The one place that knows how audio gets in and out. On the web target we talk to getUserMedia and MediaRecorder
// directly: expo-audio's web recorder asks for `audio: true`, which leaves the browser's echo cancellation, noise
// suppression and automatic gain on, and those reshape heart sounds; expo-av has no native build for SDK 55+.
// Playback goes through expo-audio, the SDK's maintained audio module.
import { createAudioPlayer, type AudioPlayer } from 'expo-audio';

export type RecorderErrorKind = 'permission-denied' | 'no-microphone' | 'unsupported' | 'busy' | 'failed';

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

export function recorderErrorFrom(error: unknown): RecorderError {
  if (error instanceof RecorderError) return error;
  const name =
    error instanceof Error || (typeof error === 'object' && error && 'name' in error)
      ? String((error as { name: unknown }).name)
      : '';
  if (name === 'NotAllowedError' || name === 'SecurityError' || name === 'PermissionDeniedError') {
    return new RecorderError('permission-denied', recorderMessages['permission-denied']);
  }
  if (name === 'NotFoundError' || name === 'OverconstrainedError' || name === 'DevicesNotFoundError') {
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
  /** Ends the take and returns the recorded audio as the browser encoded it. */
  stop: () => Promise<Blob>;
  close: () => void;
};

export async function openMicrophone(): Promise<LiveMicrophone> {
  const media = globalThis.navigator?.mediaDevices;
  if (!media?.getUserMedia || typeof MediaRecorder === 'undefined') {
    throw new RecorderError('unsupported', recorderMessages.unsupported);
  }
  let stream: MediaStream;
  try {
    stream = await media.getUserMedia(microphoneConstraints);
  } catch (error) {
    throw recorderErrorFrom(error);
  }
  if (stream.getAudioTracks().length === 0) {
    stream.getTracks().forEach((t) => t.stop());
    throw new RecorderError('no-microphone', recorderMessages['no-microphone']);
  }
  const context = audioContext();
  if (context.state === 'suspended') void context.resume().catch(() => undefined);
  const source = context.createMediaStreamSource(stream);
  const analyser = context.createAnalyser();
  analyser.fftSize = 1024;
  source.connect(analyser);
  const buffer = new Float32Array(analyser.fftSize);
  const recorder = new MediaRecorder(stream);
  const chunks: Blob[] = [];
  recorder.ondataavailable = (event) => {
    if (event.data.size > 0) chunks.push(event.data);
  };

  const close = () => {
    source.disconnect();
    stream.getTracks().forEach((t) => t.stop());
  };

  return {
    level: () => {
      analyser.getFloatTimeDomainData(buffer);
      let peak = 0;
      for (let i = 0; i < buffer.length; i++) peak = Math.max(peak, Math.abs(buffer[i] ?? 0));
      return Math.min(1, peak);
    },
    start: () => recorder.start(),
    stop: () =>
      new Promise<Blob>((resolve, reject) => {
        if (recorder.state === 'inactive') {
          resolve(new Blob(chunks, { type: recorder.mimeType }));
          return;
        }
        recorder.onstop = () => resolve(new Blob(chunks, { type: recorder.mimeType }));
        recorder.onerror = () => reject(new RecorderError('failed', recorderMessages.failed));
        recorder.stop();
      }),
    close,
  };
}

/** Decodes any format the browser knows into mono PCM, at `sampleRate` when given, else the device's rate. */
export async function decodeWithBrowser(bytes: ArrayBuffer, sampleRate?: number): Promise<Pcm> {
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

/**
 * Takes are decoded straight to 8 kHz: the heart sounds and murmurs we measure lie well below its 4 kHz Nyquist
 * limit, the browser's native resampler does the work during decoding, and the analysis then runs on a sixth of
 * the samples, which is what brings the trace in within the 300 ms target.
 */
export const takeSampleRate = 8000;

export async function decodeTake(blob: Blob): Promise<Pcm> {
  try {
    return await decodeWithBrowser(await blob.arrayBuffer(), takeSampleRate);
  } catch {
    throw new RecorderError('failed', 'The take could not be decoded. Record it again.');
  }
}

let player: AudioPlayer | null = null;

/** Plays a clip (a WAV's bytes); a second call replaces the first. */
export function playClip(wav: Uint8Array): () => void {
  player?.remove();
  const url = URL.createObjectURL(new Blob([wav as BlobPart], { type: 'audio/wav' }));
  player = createAudioPlayer(url);
  player.play();
  return () => {
    player?.pause();
    URL.revokeObjectURL(url);
  };
}
