// Bundled on its own by scripts/build-worker.mjs (Metro cannot bundle workers) into dist/workers/analysis.js.
import { analysePcm, traceForDisplay } from '@/shared/analysis';
import { AnalysisError } from '@/shared/analysis/errors';
import { importRefusalWords } from '../recorder/import-words';
import type { AnalyseRequest, AnalyseResponse } from './messages';

type WorkerScope = {
  onmessage: ((event: MessageEvent<AnalyseRequest>) => void) | null;
  postMessage: (message: AnalyseResponse) => void;
};

const scope = self as unknown as WorkerScope;

scope.onmessage = (event) => {
  const { id, samples, sampleRate, site, points } = event.data;
  const started = performance.now();
  try {
    const analysis = analysePcm(samples, sampleRate, site ? { site } : {});
    const { min, max } = traceForDisplay(samples, sampleRate, points);
    scope.postMessage({
      id,
      ok: true,
      analysis,
      trace: { min: Array.from(min), max: Array.from(max), durationS: samples.length / sampleRate },
      workerMs: performance.now() - started,
    });
  } catch (error) {
    scope.postMessage({
      id,
      ok: false,
      message:
        error instanceof AnalysisError
          ? `This take could not be measured: ${importRefusalWords[error.code]} Record it again.`
          : 'The analysis failed on this take. Record it again.',
    });
  }
};
