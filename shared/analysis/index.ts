export type {
  AnalysisOptions,
  AnalysisResult,
  BeatDetail,
  HeartSound,
  Metrics,
  MurmurScreen,
  Quality,
  QualityReason,
  SiteCode,
  SoundType,
} from './types';
export { AnalysisError, type AnalysisErrorCode } from './errors';
export { decodeWav, encodeWav16, type DecodedWav } from './wav';
export { analysePcm, analyseWav, ANALYSIS_VERSION } from './analyse';
export { traceForDisplay, type DisplayTrace } from './trace';
export { MURMUR_PAIR_THRESHOLD, screensInVisit, visitMurmurScreen } from './murmur';
