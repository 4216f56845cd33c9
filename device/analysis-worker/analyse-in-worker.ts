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
/** Ten seconds of S1/S2-like bursts at 75 bpm: enough to walk every stage of the analysis. */
export function syntheticBeats(rate = 8000, seconds = 10): Float32Array {
  const out = new Float32Array(rate * seconds);
  const cycle = 0.8 * rate;
  for (let i = 0; i < out.length; i++) {
    const inCycle = i % cycle;
    const s1 = inCycle / rate;
    const s2 = (inCycle - 0.3 * rate) / rate;
    let v = 0.002 * Math.sin(i * 1.7);
    if (s1 < 0.1) v += Math.sin(2 * Math.PI * 60 * s1) * Math.exp(-s1 * 40);
    if (s2 >= 0 && s2 < 0.08) v += 0.7 * Math.sin(2 * Math.PI * 90 * s2) * Math.exp(-s2 * 50);
    out[i] = 0.4 * v;
  }
  return out;
}

// V8 needs several runs of the hot loops before it compiles them fully; the first real take then takes a
// fraction of the time a cold run does.
const warmUpRuns = 6;

/** Loads the worker and warms it up ahead of the first take, while the operator reads the placement. */
export function warmAnalysisWorker(): void {
  if (warmed) return;
  warmed = true;
  try {
    ensureWorker();
    const beats = syntheticBeats();
    let chain: Promise<unknown> = Promise.resolve();
    for (let i = 0; i < warmUpRuns; i++)
      chain = chain.then(() => analyseInWorker(beats, 8000)).catch(() => undefined);
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
