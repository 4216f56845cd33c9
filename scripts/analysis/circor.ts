import * as fs from 'fs';
import * as path from 'path';
import { decodeWav } from '../../shared/analysis/wav';

/**
 * Loader for the CirCor DigiScope subset (Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048;
 * PhysioNet doi:10.13026/tshs-mw03).
 */
export const SITE_CODES = { AV: 'aortic', PV: 'pulmonic', TV: 'tricuspid', MV: 'mitral' } as const;

export interface Segment {
  startS: number;
  endS: number;
  /** 0 not annotated, 1 S1, 2 systole, 3 S2, 4 diastole. */
  label: number;
}

export interface Recording {
  id: string;
  patient: string;
  site: (typeof SITE_CODES)[keyof typeof SITE_CODES];
  wavPath: string;
  segments: Segment[];
  /** The patient's `#Murmur`: Present, Absent or Unknown. */
  murmur: string;
  /** Sites where the patient's murmur was heard (`#Murmur locations`, e.g. `AV+MV`); empty without one. */
  murmurLocations: Recording['site'][];
}

/**
 * The murmur screen's label of a recording: true when the patient has a murmur AND it was heard at this site, false
 * when the patient has none or it was not heard here, null when the patient's murmur status is Unknown (such
 * recordings are left out of fitting and scored as the challenge's Unknown class).
 */
export function murmurAtSite(recording: Recording): boolean | null {
  if (recording.murmur === 'Unknown') return null;
  return recording.murmur === 'Present' && recording.murmurLocations.includes(recording.site);
}

/** The open data folder: `FOURPOINT_DATA_DIR`, else `../shared/data/circor` beside the repository. */
export function dataDir(): string {
  return process.env.FOURPOINT_DATA_DIR ?? path.resolve(__dirname, '../../../shared/data/circor');
}

/** The second folder of the same dataset (150 more patients, with murmur labels), beside the first. */
export function heldOutDataDir(): string {
  return path.resolve(dataDir(), '../circor-train');
}

/**
 * Why work over the whole open data set cannot run here, in one line, or null when the folder is there. A fresh
 * clone has no `../shared` beside it: tests over the whole set skip with this line (tests/support/open-data.ts),
 * the scripts stop with it.
 */
export function openDataMissing(dir = dataDir()): string | null {
  if (fs.existsSync(dir)) return null;
  const where =
    process.env.FOURPOINT_DATA_DIR === dir
      ? `FOURPOINT_DATA_DIR=${dir}`
      : path.relative(path.resolve(__dirname, '../..'), dir);
  return `the open CirCor data is not beside the project (${where}); see DEVELOPERS.md`;
}

export function listRecordings(dir = dataDir()): Recording[] {
  const missing = openDataMissing(dir);
  if (missing) throw new Error(missing);
  const names = fs
    .readdirSync(dir)
    .filter((n) => n.endsWith('.wav'))
    .sort();
  return names.map((name) => {
    const id = name.replace(/\.wav$/, '');
    const [patient, siteCode] = id.split('_');
    const header = fs.existsSync(path.join(dir, `${patient}.txt`))
      ? fs.readFileSync(path.join(dir, `${patient}.txt`), 'utf8')
      : '';
    const murmur = /#Murmur:\s*(\S+)/.exec(header)?.[1] ?? 'Unknown';
    const locations = /#Murmur locations:\s*(\S+)/.exec(header)?.[1] ?? 'nan';
    const murmurLocations = locations
      .split('+')
      .filter((code): code is keyof typeof SITE_CODES => code in SITE_CODES)
      .map((code) => SITE_CODES[code]);
    const segments = fs
      .readFileSync(path.join(dir, `${id}.tsv`), 'utf8')
      .split('\n')
      .map((line) => line.trim().split(/\s+/).map(Number))
      .filter((parts) => parts.length === 3 && parts.every(Number.isFinite))
      .map(([startS, endS, label]) => ({ startS, endS, label }));
    return {
      id,
      patient,
      site: SITE_CODES[siteCode as keyof typeof SITE_CODES],
      wavPath: path.join(dir, name),
      segments,
      murmur,
      murmurLocations,
    };
  });
}

export function readSamples(recording: Recording) {
  return decodeWav(new Uint8Array(fs.readFileSync(recording.wavPath)));
}

/** Frame labels as HSMM states (0 S1, 1 systole, 2 S2, 3 diastole), -1 where unannotated. */
export function frameLabels(segments: Segment[], frames: number, frameRate: number): Int8Array {
  const labels = new Int8Array(frames).fill(-1);
  let j = 0;
  for (let t = 0; t < frames; t++) {
    const centre = (t + 0.5) / frameRate;
    while (j < segments.length && segments[j].endS <= centre) j++;
    const segment = segments[j];
    if (segment && segment.startS <= centre && segment.label >= 1 && segment.label <= 4)
      labels[t] = segment.label - 1;
  }
  return labels;
}

/** Annotated S1 onsets and the heart rate the dataset README defines: 60 / median interval between them. */
export function annotatedHeartRate(segments: Segment[]): number | null {
  const onsets = segments.filter((s) => s.label === 1).map((s) => s.startS);
  const intervals: number[] = [];
  for (let i = 1; i < onsets.length; i++) intervals.push(onsets[i] - onsets[i - 1]);
  if (intervals.length === 0) return null;
  intervals.sort((a, b) => a - b);
  const mid = intervals.length >> 1;
  const median = intervals.length % 2 ? intervals[mid] : (intervals[mid - 1] + intervals[mid]) / 2;
  return 60 / median;
}
