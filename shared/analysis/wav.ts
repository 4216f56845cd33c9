import { AnalysisError } from './errors';

export const MIN_SAMPLE_RATE = 2000;
export const MAX_SAMPLE_RATE = 384000;
export const MAX_DURATION_S = 600;

const FORMAT_PCM = 1;
const FORMAT_FLOAT = 3;
const FORMAT_EXTENSIBLE = 0xfffe;

export interface DecodedWav {
  sampleRate: number;
  channels: number;
  /** Mono mix, full scale -1..1. */
  samples: Float32Array;
}

function fourCC(view: DataView, offset: number): string {
  return String.fromCharCode(
    view.getUint8(offset),
    view.getUint8(offset + 1),
    view.getUint8(offset + 2),
    view.getUint8(offset + 3),
  );
}

interface Format {
  encoding: 'int' | 'float';
  channels: number;
  sampleRate: number;
  bitsPerSample: number;
  blockAlign: number;
}

function readFormat(view: DataView, offset: number, size: number): Format {
  if (size < 16)
    throw new AnalysisError('truncated', `The fmt chunk is ${size} bytes; at least 16 are needed.`);
  let formatTag = view.getUint16(offset, true);
  const channels = view.getUint16(offset + 2, true);
  const sampleRate = view.getUint32(offset + 4, true);
  const blockAlign = view.getUint16(offset + 12, true);
  const bitsPerSample = view.getUint16(offset + 14, true);
  if (formatTag === FORMAT_EXTENSIBLE) {
    if (size < 40) throw new AnalysisError('truncated', 'The extensible fmt chunk is shorter than 40 bytes.');
    formatTag = view.getUint16(offset + 24, true);
  }
  if (formatTag !== FORMAT_PCM && formatTag !== FORMAT_FLOAT) {
    throw new AnalysisError(
      'unsupported_encoding',
      `WAV format code ${formatTag} is not supported; only integer PCM and 32-bit float are.`,
    );
  }
  const encoding = formatTag === FORMAT_FLOAT ? 'float' : 'int';
  const supportedBits = encoding === 'float' ? [32, 64] : [8, 16, 24, 32];
  if (!supportedBits.includes(bitsPerSample)) {
    throw new AnalysisError(
      'unsupported_encoding',
      `${bitsPerSample}-bit ${encoding} samples are not supported.`,
    );
  }
  if (channels < 1 || channels > 32) {
    throw new AnalysisError('bad_channels', `The file declares ${channels} channels.`);
  }
  if (blockAlign !== (channels * bitsPerSample) / 8) {
    throw new AnalysisError(
      'unsupported_encoding',
      `Block align ${blockAlign} does not match ${channels} channels of ${bitsPerSample} bits.`,
    );
  }
  checkSampleRate(sampleRate);
  return { encoding, channels, sampleRate, bitsPerSample, blockAlign };
}

export function checkSampleRate(sampleRate: number): void {
  if (!Number.isFinite(sampleRate) || sampleRate < MIN_SAMPLE_RATE || sampleRate > MAX_SAMPLE_RATE) {
    throw new AnalysisError(
      'bad_sample_rate',
      `Sample rate ${sampleRate} Hz is outside ${MIN_SAMPLE_RATE}–${MAX_SAMPLE_RATE} Hz.`,
    );
  }
}

function sampleReader(view: DataView, format: Format): (offset: number) => number {
  const { encoding, bitsPerSample } = format;
  if (encoding === 'float') {
    return bitsPerSample === 32 ? (o) => view.getFloat32(o, true) : (o) => view.getFloat64(o, true);
  }
  switch (bitsPerSample) {
    case 8:
      return (o) => (view.getUint8(o) - 128) / 128;
    case 16:
      return (o) => view.getInt16(o, true) / 32768;
    case 24:
      return (o) => {
        const value = view.getUint8(o) | (view.getUint8(o + 1) << 8) | (view.getInt8(o + 2) << 16);
        return value / 8388608;
      };
    default:
      return (o) => view.getInt32(o, true) / 2147483648;
  }
}

export function decodeWav(bytes: Uint8Array): DecodedWav {
  if (bytes.length === 0) throw new AnalysisError('empty', 'The file is empty.');
  if (bytes.length < 12)
    throw new AnalysisError('truncated', `The file is ${bytes.length} bytes, shorter than a WAV header.`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const riff = fourCC(view, 0);
  if (riff === 'RIFX' || riff === 'RF64') {
    throw new AnalysisError('unsupported_encoding', `${riff} WAV files are not supported.`);
  }
  if (riff !== 'RIFF' || fourCC(view, 8) !== 'WAVE') {
    throw new AnalysisError('not_wav', 'The file is not a RIFF/WAVE audio file.');
  }

  let format: Format | null = null;
  let dataOffset = -1;
  let dataSize = 0;
  let offset = 12;
  while (offset + 8 <= bytes.length) {
    const id = fourCC(view, offset);
    const size = view.getUint32(offset + 4, true);
    const body = offset + 8;
    if (id === 'fmt ') {
      if (body + size > bytes.length)
        throw new AnalysisError('truncated', 'The fmt chunk runs past the end of the file.');
      format = readFormat(view, body, size);
    } else if (id === 'data') {
      dataOffset = body;
      dataSize = size;
      break;
    }
    offset = body + size + (size % 2);
  }
  if (!format) throw new AnalysisError('truncated', 'No fmt chunk was found before the end of the file.');
  if (dataOffset < 0) throw new AnalysisError('truncated', 'No data chunk was found.');
  const available = bytes.length - dataOffset;
  if (dataSize > available) {
    throw new AnalysisError(
      'truncated',
      `The header announces ${dataSize} bytes of audio but the file holds ${available}.`,
    );
  }
  const frames = Math.floor(dataSize / format.blockAlign);
  if (frames === 0) throw new AnalysisError('empty', 'The file holds no audio samples.');
  if (frames / format.sampleRate > MAX_DURATION_S) {
    throw new AnalysisError(
      'too_long',
      `The clip lasts ${(frames / format.sampleRate).toFixed(0)} s; at most ${MAX_DURATION_S} s are accepted.`,
    );
  }

  const read = sampleReader(view, format);
  const step = format.bitsPerSample / 8;
  const { channels } = format;
  const samples = new Float32Array(frames);
  for (let frame = 0; frame < frames; frame++) {
    let sum = 0;
    const base = dataOffset + frame * format.blockAlign;
    for (let channel = 0; channel < channels; channel++) sum += read(base + channel * step);
    if (!Number.isFinite(sum)) {
      throw new AnalysisError('bad_samples', `Sample ${frame} is not a finite number (NaN or Infinity).`);
    }
    samples[frame] = sum / channels;
  }
  return { sampleRate: format.sampleRate, channels, samples };
}

export function encodeWav16(samples: Float32Array, sampleRate: number): Uint8Array {
  const dataSize = samples.length * 2;
  const bytes = new Uint8Array(44 + dataSize);
  const view = new DataView(bytes.buffer);
  const writeId = (offset: number, id: string) => {
    for (let i = 0; i < 4; i++) view.setUint8(offset + i, id.charCodeAt(i));
  };
  writeId(0, 'RIFF');
  view.setUint32(4, 36 + dataSize, true);
  writeId(8, 'WAVE');
  writeId(12, 'fmt ');
  view.setUint32(16, 16, true);
  view.setUint16(20, FORMAT_PCM, true);
  view.setUint16(22, 1, true);
  view.setUint32(24, Math.round(sampleRate), true);
  view.setUint32(28, Math.round(sampleRate) * 2, true);
  view.setUint16(32, 2, true);
  view.setUint16(34, 16, true);
  writeId(36, 'data');
  view.setUint32(40, dataSize, true);
  for (let i = 0; i < samples.length; i++) {
    const value = samples[i] ?? 0;
    const clamped = Number.isFinite(value) ? Math.max(-1, Math.min(1, value)) : 0;
    view.setInt16(44 + i * 2, Math.round(clamped * 32767), true);
  }
  return bytes;
}
