import { AnalysisError } from './errors';
import { decodeWav, encodeWav16 } from './wav';

/*
 * Byte layout from the RIFF WAVE format (Microsoft/IBM, "Multimedia Programming Interface and Data
 * Specifications 1.0", 1991; WAVE_FORMAT_EXTENSIBLE from Microsoft's later multichannel note, from memory):
 * "RIFF" size "WAVE", then chunks; "fmt " holds format tag (1 PCM, 3 IEEE float, 0xFFFE extensible),
 * channels, rate, byte rate, block align, bits; 8-bit PCM is unsigned, wider PCM signed little-endian.
 */
interface WavSpec {
  format: number;
  channels: number;
  sampleRate: number;
  bits: number;
  frames: number[][];
  declaredDataSize?: number;
  extensibleSubFormat?: number;
}

function buildWav(spec: WavSpec): Uint8Array {
  const bytesPerSample = spec.bits / 8;
  const blockAlign = spec.channels * bytesPerSample;
  const dataSize = spec.frames.length * blockAlign;
  const fmtSize = spec.extensibleSubFormat !== undefined ? 40 : 16;
  const out = new Uint8Array(12 + 8 + fmtSize + 8 + dataSize);
  const view = new DataView(out.buffer);
  const id = (o: number, s: string) => [...s].forEach((c, i) => view.setUint8(o + i, c.charCodeAt(0)));
  id(0, 'RIFF');
  view.setUint32(4, out.length - 8, true);
  id(8, 'WAVE');
  id(12, 'fmt ');
  view.setUint32(16, fmtSize, true);
  view.setUint16(20, spec.extensibleSubFormat !== undefined ? 0xfffe : spec.format, true);
  view.setUint16(22, spec.channels, true);
  view.setUint32(24, spec.sampleRate, true);
  view.setUint32(28, spec.sampleRate * blockAlign, true);
  view.setUint16(32, blockAlign, true);
  view.setUint16(34, spec.bits, true);
  if (spec.extensibleSubFormat !== undefined) {
    view.setUint16(36, 22, true);
    view.setUint16(38, spec.bits, true);
    view.setUint16(44, spec.extensibleSubFormat, true);
  }
  const dataAt = 20 + fmtSize;
  id(dataAt, 'data');
  view.setUint32(dataAt + 4, spec.declaredDataSize ?? dataSize, true);
  let o = dataAt + 8;
  for (const frame of spec.frames) {
    for (const v of frame) {
      if (spec.format === 3) view.setFloat32(o, v, true);
      else if (spec.bits === 8) view.setUint8(o, v);
      else if (spec.bits === 16) view.setInt16(o, v, true);
      else if (spec.bits === 24) {
        view.setUint8(o, v & 0xff);
        view.setUint8(o + 1, (v >> 8) & 0xff);
        view.setInt8(o + 2, v >> 16);
      } else view.setInt32(o, v, true);
      o += bytesPerSample;
    }
  }
  return out;
}

function errorCode(fn: () => unknown): string {
  try {
    fn();
  } catch (error) {
    if (error instanceof AnalysisError) return error.code;
    throw error;
  }
  return 'no error';
}

describe('decodeWav', () => {
  test('when the file is 8-bit PCM, then 128 is zero and 0 is full negative scale', () => {
    const { samples } = decodeWav(
      buildWav({ format: 1, channels: 1, sampleRate: 8000, bits: 8, frames: [[128], [0], [192]] }),
    );
    expect(Array.from(samples)).toEqual([0, -1, 0.5]);
  });
  test('when the file is 16-bit PCM, then -32768 is -1', () => {
    const { samples, sampleRate, channels } = decodeWav(
      buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 16, frames: [[-32768], [16384], [0]] }),
    );
    expect([sampleRate, channels]).toEqual([4000, 1]);
    expect(Array.from(samples)).toEqual([-1, 0.5, 0]);
  });
  test('when the file is 24-bit PCM, then the three bytes are read as one signed value', () => {
    const { samples } = decodeWav(
      buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 24, frames: [[-8388608], [4194304], [-1]] }),
    );
    expect(samples[0]).toBe(-1);
    expect(samples[1]).toBe(0.5);
    expect(samples[2]).toBeCloseTo(-1 / 8388608, 12);
  });
  test('when the file is 32-bit PCM, then -2^31 is -1', () => {
    const { samples } = decodeWav(
      buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 32, frames: [[-2147483648], [1073741824]] }),
    );
    expect(Array.from(samples)).toEqual([-1, 0.5]);
  });
  test('when the file is 32-bit float, then values pass through', () => {
    const { samples } = decodeWav(
      buildWav({ format: 3, channels: 1, sampleRate: 4000, bits: 32, frames: [[0.25], [-0.75]] }),
    );
    expect(Array.from(samples)).toEqual([0.25, -0.75]);
  });
  test('when the file is stereo, then the channels are averaged to mono', () => {
    const { samples, channels } = decodeWav(
      buildWav({
        format: 1,
        channels: 2,
        sampleRate: 4000,
        bits: 16,
        frames: [
          [16384, 0],
          [-16384, -16384],
        ],
      }),
    );
    expect(channels).toBe(2);
    expect(Array.from(samples)).toEqual([0.25, -0.5]);
  });
  test('when the file uses WAVE_FORMAT_EXTENSIBLE with a PCM sub-format, then it decodes like PCM', () => {
    const { samples } = decodeWav(
      buildWav({
        format: 1,
        channels: 1,
        sampleRate: 48000,
        bits: 16,
        frames: [[16384]],
        extensibleSubFormat: 1,
      }),
    );
    expect(Array.from(samples)).toEqual([0.5]);
  });
  test('when a clip is written with encodeWav16 and read back, then samples agree to 16-bit precision', () => {
    const original = Float32Array.from({ length: 100 }, (_, i) => Math.sin(i / 5) * 0.9);
    const decoded = decodeWav(encodeWav16(original, 2000));
    expect(decoded.sampleRate).toBe(2000);
    for (let i = 0; i < original.length; i++)
      expect(Math.abs(decoded.samples[i] - original[i])).toBeLessThan(1 / 16000);
  });
});

describe('decodeWav on bad input', () => {
  const good = buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 16, frames: [[1], [2], [3], [4]] });
  test('when the file is empty, then the code is empty', () => {
    expect(errorCode(() => decodeWav(new Uint8Array(0)))).toBe('empty');
  });
  test('when the header is cut short, then the code is truncated', () => {
    expect(errorCode(() => decodeWav(good.slice(0, 8)))).toBe('truncated');
    expect(errorCode(() => decodeWav(good.slice(0, 30)))).toBe('truncated');
  });
  test('when the header announces more audio than the file holds, then the code is truncated', () => {
    const lying = buildWav({
      format: 1,
      channels: 1,
      sampleRate: 4000,
      bits: 16,
      frames: [[1], [2]],
      declaredDataSize: 1_000_000,
    });
    expect(errorCode(() => decodeWav(lying))).toBe('truncated');
  });
  test('when the bytes are not a RIFF/WAVE file, then the code is not_wav', () => {
    expect(
      errorCode(() => decodeWav(new TextEncoder().encode('this is a text file, not audio at all'))),
    ).toBe('not_wav');
  });
  test('when the encoding is ADPCM, a-law or 12-bit PCM, then the code is unsupported_encoding', () => {
    expect(
      errorCode(() =>
        decodeWav(buildWav({ format: 2, channels: 1, sampleRate: 4000, bits: 16, frames: [[0]] })),
      ),
    ).toBe('unsupported_encoding');
    expect(
      errorCode(() =>
        decodeWav(buildWav({ format: 6, channels: 1, sampleRate: 8000, bits: 8, frames: [[0]] })),
      ),
    ).toBe('unsupported_encoding');
    const twelve = buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 16, frames: [[0]] });
    new DataView(twelve.buffer).setUint16(34, 12, true);
    expect(errorCode(() => decodeWav(twelve))).toBe('unsupported_encoding');
  });
  test('when the sample rate is 0 Hz, below 2 kHz or absurdly high, then the code is bad_sample_rate', () => {
    for (const rate of [0, 1000, 10_000_000]) {
      expect(
        errorCode(() =>
          decodeWav(buildWav({ format: 1, channels: 1, sampleRate: rate, bits: 16, frames: [[0]] })),
        ),
      ).toBe('bad_sample_rate');
    }
  });
  test('when float data holds NaN or Infinity, then the code is bad_samples', () => {
    expect(
      errorCode(() =>
        decodeWav(buildWav({ format: 3, channels: 1, sampleRate: 4000, bits: 32, frames: [[0], [NaN]] })),
      ),
    ).toBe('bad_samples');
    expect(
      errorCode(() =>
        decodeWav(buildWav({ format: 3, channels: 1, sampleRate: 4000, bits: 32, frames: [[Infinity]] })),
      ),
    ).toBe('bad_samples');
  });
  test('when the data chunk holds no whole sample, then the code is empty', () => {
    expect(
      errorCode(() =>
        decodeWav(buildWav({ format: 1, channels: 1, sampleRate: 4000, bits: 16, frames: [] })),
      ),
    ).toBe('empty');
  });
  test('when the clip is longer than 10 minutes, then the code is too_long', () => {
    const frames = Array.from({ length: 2000 * 601 }, () => [128]);
    expect(
      errorCode(() => decodeWav(buildWav({ format: 1, channels: 1, sampleRate: 2000, bits: 8, frames }))),
    ).toBe('too_long');
  });
});
