import { SYNC_PROTOCOL_VERSION, type MutationResult } from '@/shared/protocol/sync';
import { backoffDelay, defaultBackoff, type BackoffPolicy } from './backoff';
import type { OutboxItem, SyncStorage } from './storage';
import { TransportError, type SyncTransport } from './transport';

export interface SyncEngineOptions {
  storage: SyncStorage;
  transport: SyncTransport;
  deviceId: string;
  batchSize?: number;
  pullLimit?: number;
  backoff?: BackoffPolicy;
  /** How often the engine drains on its own. */
  intervalMs?: number;
  /** A child row sent before its parent is retried this many times before it counts as refused. */
  missingParentRetries?: number;
  now?: () => number;
  random?: () => number;
  /** Calls back when the network returns; defaults to the browser's `online` event where there is one. */
  onOnline?: (callback: () => void) => () => void;
  onStatus?: (status: SyncStatus) => void;
}

export interface SyncStatus {
  running: boolean;
  lastRunAt?: number;
  lastError?: string;
  /** Set when the server refused this app version; the message is for the user. */
  outdated?: string;
}

export interface SyncReport {
  sent: number;
  conflicts: number;
  failed: number;
  retrying: number;
  pulledRows: number;
  error?: string;
}

const ACTIVE = new Set(['waiting', 'sending']);
const rowKey = (item: OutboxItem) => `${item.entity}:${item.rowId}`;

function browserOnline(callback: () => void): () => void {
  const target = globalThis as unknown as {
    addEventListener?: (type: string, cb: () => void) => void;
    removeEventListener?: (type: string, cb: () => void) => void;
  };
  if (typeof target.addEventListener !== 'function') return () => undefined;
  target.addEventListener('online', callback);
  return () => target.removeEventListener?.('online', callback);
}

/**
 * Drains the outbox and pulls changes. One run at a time: a call while a run is going asks for one more run
 * after it. Every state change is written to storage before the next network call, so a reload mid-way resumes.
 */
export class SyncEngine {
  private readonly o: Required<Omit<SyncEngineOptions, 'onStatus'>> & Pick<SyncEngineOptions, 'onStatus'>;
  private running: Promise<SyncReport> | null = null;
  private again = false;
  private timer: ReturnType<typeof setInterval> | null = null;
  private wake: ReturnType<typeof setTimeout> | null = null;
  private unsubscribeOnline: (() => void) | null = null;
  private current: SyncStatus = { running: false };

  constructor(options: SyncEngineOptions) {
    this.o = {
      batchSize: 50,
      pullLimit: 200,
      backoff: defaultBackoff,
      intervalMs: 30_000,
      missingParentRetries: 8,
      now: Date.now,
      random: Math.random,
      onOnline: browserOnline,
      ...options,
    };
  }

  get status(): SyncStatus {
    return { ...this.current };
  }

  start(): void {
    if (this.timer) return;
    this.timer = setInterval(() => void this.sync(), this.o.intervalMs);
    this.unsubscribeOnline = this.o.onOnline(() => void this.sync());
    void this.sync();
  }

  stop(): void {
    if (this.timer) clearInterval(this.timer);
    if (this.wake) clearTimeout(this.wake);
    this.unsubscribeOnline?.();
    this.timer = null;
    this.wake = null;
    this.unsubscribeOnline = null;
  }

  /** Drain then pull, now. Resolves when this run (and any run asked for during it) is over. */
  sync(): Promise<SyncReport> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      let report: SyncReport;
      do {
        this.again = false;
        report = await this.runOnce();
      } while (this.again);
      return report;
    })().finally(() => {
      this.running = null;
      void this.scheduleWake();
    });
    return this.running;
  }

  private setStatus(patch: Partial<SyncStatus>): void {
    this.current = { ...this.current, ...patch };
    this.o.onStatus?.(this.status);
  }

  private async runOnce(): Promise<SyncReport> {
    const report: SyncReport = { sent: 0, conflicts: 0, failed: 0, retrying: 0, pulledRows: 0 };
    this.setStatus({ running: true });
    try {
      await this.drainMutations(report);
      await this.drainClips(report);
      await this.pull(report);
      this.setStatus({ lastError: undefined, outdated: undefined });
    } catch (error) {
      report.error = error instanceof Error ? error.message : String(error);
      if (error instanceof TransportError && error.outdated) this.setStatus({ outdated: error.message });
      this.setStatus({ lastError: report.error });
    } finally {
      this.setStatus({ running: false, lastRunAt: this.o.now() });
    }
    return report;
  }

  private async scheduleWake(): Promise<void> {
    if (!this.timer) return;
    const items = await this.o.storage.listOutbox();
    const next = Math.min(...items.filter((i) => ACTIVE.has(i.state)).map((i) => i.nextAttemptAt));
    if (!Number.isFinite(next)) return;
    if (this.wake) clearTimeout(this.wake);
    this.wake = setTimeout(() => void this.sync(), Math.max(0, next - this.o.now()));
  }

  private async retryLater(item: OutboxItem, message: string, report: SyncReport): Promise<void> {
    const attempts = item.attempts + 1;
    report.retrying++;
    await this.o.storage.updateOutboxItem(item.id, {
      state: 'waiting',
      attempts,
      lastError: message,
      nextAttemptAt: this.o.now() + backoffDelay(attempts, this.o.backoff, this.o.random),
    });
  }

  /** Mutations due now, oldest first, one per row (a row's later change waits for the earlier's answer). */
  private pickBatch(items: OutboxItem[]): OutboxItem[] {
    const now = this.o.now();
    const blockedRows = new Set<string>();
    const batch: OutboxItem[] = [];
    for (const item of items) {
      if (item.kind !== 'mutation' || !ACTIVE.has(item.state) || !item.mutation) continue;
      const key = rowKey(item);
      if (blockedRows.has(key)) continue;
      blockedRows.add(key);
      if (item.nextAttemptAt > now) continue;
      batch.push(item);
      if (batch.length >= this.o.batchSize) break;
    }
    return batch;
  }

  private async drainMutations(report: SyncReport): Promise<void> {
    for (;;) {
      const items = await this.o.storage.listOutbox();
      const batch = this.pickBatch(items);
      if (batch.length === 0) return;
      for (const item of batch) await this.o.storage.updateOutboxItem(item.id, { state: 'sending' });

      let results: MutationResult[];
      try {
        const response = await this.o.transport.push({
          protocolVersion: SYNC_PROTOCOL_VERSION,
          deviceId: this.o.deviceId,
          mutations: batch.map((i) => i.mutation!),
        });
        results = response.results;
      } catch (error) {
        const transportError = asTransportError(error);
        if (transportError.outdated) {
          for (const item of batch) await this.o.storage.updateOutboxItem(item.id, { state: 'waiting' });
          throw transportError;
        }
        for (const item of batch) {
          if (transportError.temporary) await this.retryLater(item, transportError.message, report);
          else await this.refuse(item, transportError.message, report);
        }
        if (transportError.temporary) throw transportError;
        continue;
      }

      const byId = new Map(results.map((r) => [r.mutationId, r]));
      for (const item of batch) {
        const result = byId.get(item.mutation!.mutationId);
        await this.settle(item, result, items, report);
      }
    }
  }

  private async refuse(item: OutboxItem, reason: string, report: SyncReport): Promise<void> {
    report.failed++;
    await this.o.storage.updateOutboxItem(item.id, {
      state: 'failed',
      lastError: reason,
      attempts: item.attempts + 1,
    });
  }

  private async settle(
    item: OutboxItem,
    result: MutationResult | undefined,
    all: OutboxItem[],
    report: SyncReport,
  ): Promise<void> {
    const storage = this.o.storage;
    if (!result) return this.retryLater(item, 'The server did not answer for this change.', report);

    const appliedVersion =
      result.status === 'applied'
        ? result.newVersion
        : result.status === 'already_applied' && result.original === 'applied'
          ? result.newVersion
          : undefined;
    if (appliedVersion !== undefined) {
      const mutation = item.mutation!;
      await storage.updateOutboxItem(item.id, {
        state: 'sent',
        progress: 1,
        lastError: undefined,
        attempts: item.attempts + 1,
      });
      await storage.recordAcknowledged({
        entity: mutation.entity,
        rowId: mutation.id,
        newVersion: appliedVersion,
        change: mutation.change,
      });
      // Later local edits of this row were made on top of this one: base them on the version it produced.
      for (const later of all) {
        if (later.id === item.id || later.kind !== 'mutation' || !ACTIVE.has(later.state) || !later.mutation)
          continue;
        if (rowKey(later) !== rowKey(item) || later.createdAt < item.createdAt) continue;
        if (later.mutation.baseVersion !== mutation.baseVersion) continue;
        later.mutation = { ...later.mutation, baseVersion: appliedVersion };
        await storage.updateOutboxItem(later.id, { mutation: later.mutation });
      }
      report.sent++;
      return;
    }
    if (result.status === 'conflict' || result.status === 'already_applied') {
      report.conflicts++;
      const conflictId = result.conflictId;
      await storage.updateOutboxItem(item.id, {
        state: 'conflict',
        conflictId,
        attempts: item.attempts + 1,
        lastError: 'Another device changed this record first; an admin will choose what to keep.',
      });
      return;
    }
    if (result.status === 'rejected') {
      if (result.code === 'server_error') return this.retryLater(item, result.reason, report);
      if (result.code === 'missing_parent' && item.attempts < this.o.missingParentRetries) {
        return this.retryLater(item, result.reason, report);
      }
      return this.refuse(item, result.reason, report);
    }
  }

  private async drainClips(report: SyncReport): Promise<void> {
    const storage = this.o.storage;
    const items = (await storage.listOutbox()).filter(
      (i) => i.kind === 'clip' && ACTIVE.has(i.state) && i.blobHash && i.nextAttemptAt <= this.o.now(),
    );
    for (const item of items) {
      const sha256 = item.blobHash!;
      await storage.updateOutboxItem(item.id, { state: 'sending' });
      try {
        let status = await this.o.transport.blobStatus(sha256);
        if (status.state !== 'stored') {
          if (status.state === 'failed' && !item.uploadUrl)
            throw new TransportError(status.failure ?? 'The server could not take this clip.', {
              temporary: false,
            });
          const bytes = await storage.readBlob(sha256);
          if (!bytes) {
            await this.refuse(item, 'The sealed clip is no longer on this device.', report);
            continue;
          }
          await this.sendClip(item, sha256, bytes);
          // Every byte arrived, which is not yet the clip kept: only the server's word that it is stored counts.
          status = await this.o.transport.blobStatus(sha256);
          if (status.state === 'failed')
            throw new TransportError(status.failure ?? 'The server could not take this clip.', {
              temporary: false,
            });
          if (status.state !== 'stored')
            throw new TransportError(
              'The clip reached the server but is not stored yet; it will be checked again.',
              {
                temporary: true,
              },
            );
        }
        await storage.updateOutboxItem(item.id, {
          state: 'sent',
          progress: 1,
          lastError: undefined,
          attempts: item.attempts + 1,
        });
        report.sent++;
      } catch (error) {
        const transportError = asTransportError(error);
        if (transportError.outdated) {
          await storage.updateOutboxItem(item.id, { state: 'waiting' });
          throw transportError;
        }
        if (transportError.temporary) {
          await this.retryLater(item, transportError.message, report);
        } else {
          await this.refuse(item, transportError.message, report);
        }
      }
    }
  }

  /**
   * Sends the clip's bytes, resuming the upload the item names. When the server has lost that upload (tus: 404 or
   * 410 on its URL), the URL is forgotten and the whole clip goes up again as a new upload in this same run: the
   * server keeps a clip by its hash, so a clip sent twice is stored once, and nothing of it was kept before.
   */
  private async sendClip(item: OutboxItem, sha256: string, bytes: Uint8Array): Promise<void> {
    const storage = this.o.storage;
    let uploadUrl = item.uploadUrl;
    for (let restarts = 0; ; restarts++) {
      let lastWritten = -1;
      try {
        await this.o.transport.uploadClip({
          sha256,
          bytes,
          uploadUrl,
          onUploadUrl: (url) => storage.updateOutboxItem(item.id, { uploadUrl: url }),
          onProgress: (sent, total) => {
            const progress = total > 0 ? Math.min(0.99, sent / total) : 0;
            if (progress - lastWritten < 0.05) return;
            lastWritten = progress;
            void storage.updateOutboxItem(item.id, { progress });
          },
        });
        return;
      } catch (error) {
        if (!(error instanceof TransportError && error.uploadLost)) throw error;
        uploadUrl = undefined;
        await storage.updateOutboxItem(item.id, { uploadUrl: undefined, progress: 0 });
        // Lost twice in one run: the server's staging is in trouble; the backoff decides when to try again.
        if (restarts >= 1) throw error;
      }
    }
  }

  private async pull(report: SyncReport): Promise<void> {
    const storage = this.o.storage;
    for (;;) {
      const checkpoint = await storage.getCheckpoint();
      const page = await this.o.transport.pull({
        protocolVersion: SYNC_PROTOCOL_VERSION,
        deviceId: this.o.deviceId,
        checkpoint,
        limit: this.o.pullLimit,
      });
      // Stored first, then the checkpoint moves: a crash between the two re-applies the page, which is harmless.
      await storage.applyPulledRows(page.rows);
      await storage.setCheckpoint(page.nextCheckpoint);
      report.pulledRows += page.rows.length;
      if (!page.hasMore) return;
    }
  }
}

function asTransportError(error: unknown): TransportError {
  if (error instanceof TransportError) return error;
  const message = error instanceof Error ? error.message : String(error);
  return new TransportError(message, { temporary: true });
}
