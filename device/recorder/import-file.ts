import * as DocumentPicker from 'expo-document-picker';
import { decodeWav } from '@/shared/analysis/wav';
import { AnalysisError } from '@/shared/analysis/errors';
import { importRefusalWords } from './import-words';
import { decodeWithBrowser, type Pcm } from './recorder';

export class ImportError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ImportError';
  }
}

export type ImportedClip = Pcm & { name: string; bytes: Uint8Array };

function looksLikeWav(bytes: Uint8Array, name: string): boolean {
  const head = String.fromCharCode(...bytes.subarray(0, 4));
  return head === 'RIFF' || head === 'RIFX' || head === 'RF64' || /\.wave?$/i.test(name);
}

/** WAV through our own decoder (any common rate and depth); anything else through the browser's decoder. */
export async function decodeImport(bytes: Uint8Array, name: string): Promise<Pcm> {
  if (bytes.length === 0) throw new ImportError(`“${name}” is empty, so there is nothing to analyse.`);
  if (looksLikeWav(bytes, name)) {
    try {
      const wav = decodeWav(bytes);
      return { samples: wav.samples, sampleRate: wav.sampleRate };
    } catch (error) {
      const reason = error instanceof AnalysisError ? importRefusalWords[error.code] : 'the file is damaged.';
      throw new ImportError(`“${name}” could not be read: ${reason} Choose another file.`);
    }
  }
  try {
    return await decodeWithBrowser(bytes.slice().buffer);
  } catch {
    throw new ImportError(
      `“${name}” is not audio this browser can read. Export it from the stethoscope as WAV and try again.`,
    );
  }
}

/** Lets the operator pick a file; null when they cancel. */
export async function pickAudioFile(): Promise<ImportedClip | null> {
  const picked = await DocumentPicker.getDocumentAsync({
    type: ['audio/*', '.wav', '.wave'],
    copyToCacheDirectory: false,
    multiple: false,
  });
  if (picked.canceled || !picked.assets?.[0]) return null;
  const asset = picked.assets[0];
  const bytes = asset.file
    ? new Uint8Array(await asset.file.arrayBuffer())
    : new Uint8Array(await (await fetch(asset.uri)).arrayBuffer());
  const pcm = await decodeImport(bytes, asset.name);
  return { ...pcm, name: asset.name, bytes };
}
