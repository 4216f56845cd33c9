import fs from 'node:fs';
import { encodeWav16 } from '@/shared/analysis/wav';
import { circorFixture } from '@/tests/support/circor-fixtures';
import { decodeImport, ImportError } from './import-file';

// CirCor DigiScope (Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048), vendored in
// tests/fixtures/circor; the .hea header of each record states its rate and sample count, an outside reference
// for the decoder.
const record = '36327_MV';

describe('decodeImport', () => {
  test('when a CirCor WAV is imported, then its rate and length match the record header', async () => {
    const header = fs
      .readFileSync(circorFixture(`${record}.hea`), 'utf8')
      .split('\n')[0]!
      .split(' ');
    const bytes = new Uint8Array(fs.readFileSync(circorFixture(`${record}.wav`)));
    const pcm = await decodeImport(bytes, `${record}.wav`);
    expect(pcm.sampleRate).toBe(Number(header[2]));
    expect(pcm.samples.length).toBe(Number(header[3]));
  });

  test('when the file is empty, then the message names it and says there is nothing to analyse', async () => {
    await expect(decodeImport(new Uint8Array(), 'blank.wav')).rejects.toThrow(/“blank.wav” is empty/);
  });

  test('when a WAV is cut short, then the import is refused in words, without the decoder’s chunk sizes', async () => {
    const whole = encodeWav16(new Float32Array(4000).fill(0.1), 4000);
    const cut = whole.subarray(0, 200);
    const failure = await decodeImport(cut, 'cut.wav').catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(ImportError);
    expect((failure as Error).message).toBe(
      '“cut.wav” could not be read: the file is cut short or damaged. Choose another file.',
    );
  });

  test('when the bytes are not audio the browser can read, then the import is refused and asks for WAV', async () => {
    const garbage = new TextEncoder().encode('this is a spreadsheet, not a recording');
    await expect(decodeImport(garbage, 'notes.mp3')).rejects.toThrow(/not audio this browser can read/);
  });
});
