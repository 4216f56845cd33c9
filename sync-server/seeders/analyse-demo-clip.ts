import { analysePcm } from '@/shared/analysis';
import type { AnalyseClip } from './demo';

/** The server's analysis of record, the same code the device runs. */
export const analyseDemoClip: AnalyseClip = (samples, sampleRate, site) =>
  analysePcm(samples, sampleRate, { site });
