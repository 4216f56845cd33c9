import type { SiteCode } from '@/shared/analysis/types';
import type { AnalyseRequest, AnalyseResponse } from './messages';

export const workerUrl = '/workers/analysis.js';
export const tracePoints = 600;

export type WorkerAnalysis = Extract<AnalyseResponse, { ok: true }>;

let worker: Worker | null = null;
let warmed = false;
let nextId = 1;
const waiting = new Map<number, { resolve: (r: WorkerAnalysis) => void; reject: (e: Error) => void }>();

function ensureWorker(): Worker {
  if (worker) return worker;
  if (typeof Worker === 'undefined')
    throw new Error('This browser cannot run the analysis in the background (no Web Worker).');
  worker = new Worker(workerUrl);
  worker.onmessage = (event: MessageEvent<AnalyseResponse>) => {
    const pending = waiting.get(event.data.id);
    if (!pending) return;
    waiting.delete(event.data.id);
    if (event.data.ok) pending.resolve(event.data);
    else pending.reject(new Error(event.data.message));
  };
  worker.onerror = (event) => {
    event.preventDefault();
    const failure = new Error(
      'The analysis could not start. Reload the app while online once so it is stored on this device.',
    );
    waiting.forEach((p) => p.reject(failure));
    waiting.clear();
    worker?.terminate();
    worker = null;
  };
  return worker;
}

/** Loads the worker ahead of the first take, so the first trace is not slowed by a script load. */
export function warmAnalysisWorker(): void {
  if (warmed) return;
  warmed = true;
  try {
    ensureWorker();
    // A throwaway run compiles the analysis' hot loops, so the first real take is as quick as the rest.
    const rate = 8000;
    const noise = new Float32Array(rate * 4);
    for (let i = 0; i < noise.length; i++)
      noise[i] = (Math.random() - 0.5) * 0.01 + 0.3 * Math.sin(i / 20) * Math.exp(-((i % 6400) / 300));
    void analyseInWorker(noise, rate).catch(() => undefined);
  } catch {
    /* reported on first use */
  }
}

/** Runs the project's analysis off the UI thread. The samples are copied, so the caller keeps its own. */
export function analyseInWorker(
  samples: Float32Array,
  sampleRate: number,
  site?: SiteCode,
): Promise<WorkerAnalysis> {
  const target = ensureWorker();
  const id = nextId++;
  const copy = samples.slice();
  return new Promise((resolve, reject) => {
    waiting.set(id, { resolve, reject });
    const message: AnalyseRequest = {
      id,
      samples: copy,
      sampleRate,
      points: tracePoints,
      ...(site ? { site } : {}),
    };
    target.postMessage(message, [copy.buffer]);
  });
}
