import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { OpenClipJob, OpenClipResult } from '../use-cases/sync/open-clip-job';

const WORKER_ENTRY = path.join(__dirname, '../use-cases/sync/open-clip-worker.js');

type Pending = { resolve(result: OpenClipResult): void; reject(error: Error): void };

/**
 * Opens and analyses received clips in one worker thread, off the thread that answers requests. Jobs run one at
 * a time (the machine may have two cores, and a long clip holds tens of megabytes while it is analysed). A
 * worker that dies fails its jobs and the next job starts a new one.
 */
export class ClipWorker {
  private worker: Worker | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextId = 0;
  private queue: Promise<unknown> = Promise.resolve();

  open(job: OpenClipJob): Promise<OpenClipResult> {
    const run = this.queue.then(() => this.send(job));
    this.queue = run.catch(() => undefined);
    return run;
  }

  async close(): Promise<void> {
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }

  private send(job: OpenClipJob): Promise<OpenClipResult> {
    const worker = this.started();
    const id = ++this.nextId;
    worker.ref();
    return new Promise<OpenClipResult>((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      worker.postMessage({ id, job });
    }).finally(() => {
      if (this.pending.size === 0) worker.unref();
    });
  }

  private started(): Worker {
    if (this.worker) return this.worker;
    const worker = new Worker(WORKER_ENTRY);
    // An idle worker does not keep the process alive (tests, a CLI); send() holds it while a job runs.
    worker.unref();
    worker.on('message', (message: { id: number; result?: OpenClipResult; error?: string }) => {
      const waiting = this.pending.get(message.id);
      if (!waiting) return;
      this.pending.delete(message.id);
      if (message.error !== undefined) waiting.reject(new Error(message.error));
      else waiting.resolve(message.result!);
    });
    const failAll = (error: Error) => {
      if (this.worker === worker) this.worker = null;
      for (const waiting of this.pending.values()) waiting.reject(error);
      this.pending.clear();
    };
    worker.on('error', failAll);
    worker.on('exit', (code) => failAll(new Error(`The clip worker stopped (exit code ${code}).`)));
    this.worker = worker;
    return worker;
  }
}

let shared: ClipWorker | undefined;

/** The process's one clip worker. */
export function clipWorker(): ClipWorker {
  shared ??= new ClipWorker();
  return shared;
}
