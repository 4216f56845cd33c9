export type SiteCode = 'mitral' | 'tricuspid' | 'aortic' | 'pulmonic';
export type SoundType = 'S1' | 'S2';

export interface HeartSound {
  type: SoundType;
  startS: number;
  endS: number;
  peakAmplitude: number;
}

export type QualityReason =
  | 'too_short'
  | 'clipped'
  | 'too_noisy'
  | 'too_few_cycles'
  | 'no_heartbeat'
  | 'rate_out_of_range'
  | 'rate_unsure';

export interface Quality {
  verdict: 'good' | 'usable' | 'retake';
  reasons: { code: QualityReason; message: string }[];
  /** The figures the verdict was drawn from. */
  measures?: {
    /** Envelope autocorrelation at the heart cycle, 0–1; null when no cycle was found. */
    periodicity: number | null;
    clippedFraction: number;
    /** Smaller of the systolic and diastolic rest-interval activity: noise raises both, a murmur one. */
    restActivity: number | null;
  };
}

/** One S1 → S2 → next S1 cycle; times in seconds from the clip start. */
export interface BeatDetail {
  s1StartS: number;
  s1EndS: number;
  s2StartS: number;
  s2EndS: number;
  nextS1StartS: number | null;
  /** Centre of S1 to centre of the next S1 (energy-weighted centres). */
  intervalMs: number | null;
  /** S1 onset to S2 onset. */
  systoleMs: number;
  /** S2 onset to next S1 onset. */
  diastoleMs: number | null;
  /** RMS between S1 and S2 over the mean RMS of that S1 and S2. */
  systolicActivity: number | null;
  /** RMS between S2 and the next S1 over the mean RMS of that S2 and the next S1. */
  diastolicActivity: number | null;
}

export interface Metrics {
  heartRateBpm: number | null;
  sdnnMs: number | null;
  rmssdMs: number | null;
  /** Percent of NN intervals, 0–100. */
  pnn50: number | null;
  irregularRhythm: boolean;
  s1DurationMs: number | null;
  s2DurationMs: number | null;
  systoleMs: number | null;
  diastoleMs: number | null;
  systoleDiastoleRatio: number | null;
  s1s2PeakRatio: number | null;
  s1s2EnergyRatio: number | null;
  systolicActivity: number | null;
  diastolicActivity: number | null;
  usableCycles: number;
  beats: BeatDetail[];
}

/**
 * The murmur screen of one site. `possible` is always shown as "possible murmur: refer to a licensed clinician",
 * never as a diagnosis; `unsure` means the clip was too poor to tell.
 */
export interface MurmurScreen {
  murmur: 'possible' | 'unlikely' | 'unsure';
  /** The model's score, 0–1 (0 when unsure); `possible` at or above the model's threshold. */
  score: number;
  /** Why, in plain words. */
  reasons: string[];
}

export interface AnalysisResult {
  /** Sample rate of the input, not the working rate. */
  sampleRate: number;
  durationS: number;
  heartRateBpm: number | null;
  sounds: HeartSound[];
  metrics: Metrics;
  quality: Quality;
  screen: MurmurScreen;
  analysisVersion: string;
}

export interface AnalysisOptions {
  site?: SiteCode;
}
