import type { AnalysisResult, SiteCode } from '@/shared/analysis/types';

export type AnalyseRequest = {
  id: number;
  samples: Float32Array;
  sampleRate: number;
  site?: SiteCode;
  /** Columns of the display trace. */
  points: number;
};

export type DisplayTraceMessage = { min: number[]; max: number[]; durationS: number };

export type AnalyseResponse =
  | { id: number; ok: true; analysis: AnalysisResult; trace: DisplayTraceMessage; workerMs: number }
  | { id: number; ok: false; message: string };
