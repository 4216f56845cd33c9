import { AnalysisError } from '@/shared/analysis/errors';
import { decodeWav } from '@/shared/analysis/wav';

type AnalyseWav = (bytes: Uint8Array) => unknown;

let analyser: AnalyseWav | null | undefined;

// The full pipeline's entry point lands in shared/analysis/index.ts; until it does, the server records what the
// decoder alone can tell (format and length), so a clip is never lost for want of an analysis.
function loadAnalyser(): AnalyseWav | null {
  if (analyser !== undefined) return analyser;
  try {
    const mod = require('../../../../shared/analysis') as { analyseWav?: AnalyseWav };
    analyser = typeof mod.analyseWav === 'function' ? mod.analyseWav : null;
  } catch {
    analyser = null;
  }
  return analyser;
}

export function analyseClip(wav: Uint8Array): unknown {
  try {
    const analyse = loadAnalyser();
    if (analyse) return { source: 'server', ...(analyse(wav) as object) };
    const decoded = decodeWav(wav);
    return {
      source: 'server',
      decodedOnly: true,
      sampleRate: decoded.sampleRate,
      channels: decoded.channels,
      durationS: decoded.samples.length / decoded.sampleRate,
    };
  } catch (error) {
    if (error instanceof AnalysisError)
      return { source: 'server', error: { code: error.code, message: error.message } };
    throw error;
  }
}
