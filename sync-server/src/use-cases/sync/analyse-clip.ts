import { analysePcm } from '@/shared/analysis/analyse';
import { AnalysisError } from '@/shared/analysis/errors';
import { decodeWav } from '@/shared/analysis/wav';
import type { ClipAnalysis, StoredTrace } from '@/shared/protocol/analysis';
import { traceOfClip } from '../clip-trace';

export interface ClipReading {
  /** The analysis of record, or the reason the analysis refused the clip. */
  analysis: ClipAnalysis;
  /** The display trace kept beside the clip; null when the clip is not a WAV the decoder reads. */
  trace: StoredTrace | null;
}

const refused = (error: AnalysisError): ClipAnalysis => ({
  source: 'server',
  error: { code: error.code, message: error.message },
});

/** The server's analysis of an opened clip and its display trace, from one decoding of the WAV. */
export function analyseClip(wav: Uint8Array): ClipReading {
  let decoded: ReturnType<typeof decodeWav>;
  try {
    decoded = decodeWav(wav);
  } catch (error) {
    if (error instanceof AnalysisError) return { analysis: refused(error), trace: null };
    throw error;
  }
  const trace = traceOfClip(decoded.samples, decoded.sampleRate);
  try {
    return { analysis: { source: 'server', ...analysePcm(decoded.samples, decoded.sampleRate) }, trace };
  } catch (error) {
    if (error instanceof AnalysisError) return { analysis: refused(error), trace };
    throw error;
  }
}
