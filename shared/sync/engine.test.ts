// The device sync engine against a scripted transport: an in-memory stand-in for the clinic server that can drop
// calls, refuse one mutation, or refuse the app version, with the clock and the jitter under the test's control.
import { randomUUID } from 'node:crypto';
import {
  OUTDATED_CLIENT_MESSAGE,
  type Mutation,
  type MutationResult,
  type PullRequest,
  type PushRequest,
} from '@/shared/protocol/sync';
import { SyncEngine } from './engine';
import { MemorySyncStorage } from './memory-storage';
import { clipItem, mutationItem } from './outbox';
import type { OutboxItem } from './storage';
import { TransportError, type ClipUpload, type SyncTransport } from './transport';

type Script = {
  /** Calls (of any kind) to cut off before they reach the server. */
  drop?: number;
  /** Mutation ids the server refuses, with its reason. */
  reject?: Map<string, string>;
  /** Every call answers 426. */
  outdated?: boolean;
  /**
   * Uploads whose last byte arrives but which the server does not process then (it died in between): the bytes
   * wait in staging until the next request for that upload, as a restarted server's HEAD processes them.
   */
  unprocessedUploads?: number;
};

class ScriptedServer implements SyncTransport {
  readonly calls: string[] = [];
  readonly pushedMutationIds: string[] = [];
  readonly rows = new Map<string, { version: number; change: Mutation['change'] }>();
  readonly blobs = new Map<string, Uint8Array>();
  readonly staged = new Map<string, Uint8Array>();
  private dropsLeft: number;
  private unprocessedLeft: number;

  constructor(private readonly script: Script = {}) {
    this.dropsLeft = script.drop ?? 0;
    this.unprocessedLeft = script.unprocessedUploads ?? 0;
  }

  private gate(name: string): void {
    this.calls.push(name);
    if (this.script.outdated)
      throw new TransportError(OUTDATED_CLIENT_MESSAGE, { temporary: false, status: 426, outdated: true });
    if (this.dropsLeft > 0) {
      this.dropsLeft--;
      throw new TransportError('The clinic server cannot be reached.', { temporary: true });
    }
  }

  async push(request: PushRequest) {
    this.gate('push');
    const results: MutationResult[] = request.mutations.map((m) => {
      this.pushedMutationIds.push(m.mutationId);
      const reason = this.script.reject?.get(m.mutationId);
      if (reason) return { mutationId: m.mutationId, status: 'rejected', code: 'invalid_change', reason };
      const key = `${m.entity}:${m.id}`;
      const version = (this.rows.get(key)?.version ?? 0) + 1;
      this.rows.set(key, { version, change: m.change });
      return { mutationId: m.mutationId, status: 'applied', newVersion: version };
    });
    return { results };
  }

  async pull(request: PullRequest) {
    this.gate('pull');
    return { rows: [], nextCheckpoint: request.checkpoint, hasMore: false };
  }

  async blobStatus(sha256: string) {
    this.gate('blobStatus');
    return {
      sha256,
      state: this.blobs.has(sha256) ? ('stored' as const) : ('missing' as const),
      failure: null,
    };
  }

  async uploadClip(upload: ClipUpload) {
    this.gate('uploadClip');
    const url = `/uploads/${upload.sha256}`;
    const staged = upload.uploadUrl === url ? this.staged.get(upload.sha256) : undefined;
    if (staged) {
      // The resumed upload's HEAD finds every byte staged: the server processes them and answers "complete".
      this.staged.delete(upload.sha256);
      this.blobs.set(upload.sha256, staged);
      return;
    }
    await upload.onUploadUrl(url);
    upload.onProgress(upload.bytes.length / 2, upload.bytes.length);
    upload.onProgress(upload.bytes.length, upload.bytes.length);
    if (this.unprocessedLeft > 0) {
      this.unprocessedLeft--;
      this.staged.set(upload.sha256, upload.bytes);
      return;
    }
    this.blobs.set(upload.sha256, upload.bytes);
  }
}

function clientChange(name: string): Mutation['change'] {
  return { firstName: name, lastName: 'Testrow' };
}

function setup(script: Script, backoff = { baseMs: 1_000, maxMs: 60_000 }) {
  const storage = new MemorySyncStorage();
  const server = new ScriptedServer(script);
  const clock = { now: 0 };
  const engine = new SyncEngine({
    storage,
    transport: server,
    deviceId: randomUUID(),
    backoff,
    now: () => clock.now,
    // Jitter pinned to its top: each delay is the whole capped exponential step.
    random: () => 1,
    onOnline: () => () => undefined,
  });
  return { storage, server, clock, engine };
}

const byId = async (storage: MemorySyncStorage): Promise<Map<string, OutboxItem>> =>
  new Map((await storage.listOutbox()).map((i) => [i.id, i]));

describe('sync engine over a scripted transport', () => {
  test('when the transport drops the first three calls, then items wait with exponential backoff and are sent once calls get through', async () => {
    const { storage, server, clock, engine } = setup({ drop: 3 });
    const first = mutationItem({
      mutationId: randomUUID(),
      entity: 'clients',
      rowId: randomUUID(),
      baseVersion: 0,
      change: clientChange('Ilse'),
      now: 0,
    });
    const second = mutationItem({
      mutationId: randomUUID(),
      entity: 'clients',
      rowId: randomUUID(),
      baseVersion: 0,
      change: clientChange('Oto'),
      now: 0,
    });
    const bytes = new Uint8Array(4096).map((_, i) => (i * 31) % 251);
    const hash = 'ab'.repeat(32);
    const clip = clipItem({
      id: randomUUID(),
      rowId: randomUUID(),
      blobHash: hash,
      sizeBytes: bytes.length,
      now: 1,
    });
    storage.putBlob(hash, bytes);
    for (const item of [first, second, clip]) await storage.putOutboxItem(item);

    // Equal jitter (AWS Architecture Blog, M. Brooker, "Exponential Backoff And Jitter", 2015, from memory): the wait is
    // min(cap, base * 2^(attempt-1)) / 2 plus up to as much again at random; with the random part at its top,
    // 1 s after the first failure and 2 s after the second.
    const run1 = await engine.sync();
    expect(run1.error).toBe('The clinic server cannot be reached.');
    let items = await byId(storage);
    for (const id of [first.id, second.id]) {
      expect(items.get(id)).toMatchObject({
        state: 'waiting',
        attempts: 1,
        nextAttemptAt: 1_000,
        lastError: 'The clinic server cannot be reached.',
      });
    }
    expect(items.get(clip.id)?.state).toBe('waiting');

    clock.now = 1_000;
    await engine.sync();
    items = await byId(storage);
    for (const id of [first.id, second.id])
      expect(items.get(id)).toMatchObject({ state: 'waiting', attempts: 2, nextAttemptAt: 1_000 + 2_000 });

    // Before the rows are due again nothing pushes them; the clip's first try is the third dropped call.
    clock.now = 2_999;
    await engine.sync();
    items = await byId(storage);
    expect(server.calls.filter((c) => c === 'push')).toHaveLength(2);
    expect(items.get(first.id)).toMatchObject({ state: 'waiting', attempts: 2 });
    expect(items.get(clip.id)).toMatchObject({ state: 'waiting', attempts: 1, nextAttemptAt: 2_999 + 1_000 });
    expect(server.rows.size).toBe(0);

    clock.now = 4_000;
    const last = await engine.sync();
    expect(last.error).toBeUndefined();
    items = await byId(storage);
    for (const item of items.values()) expect(item).toMatchObject({ state: 'sent', progress: 1 });
    expect(server.rows.size).toBe(2);
    expect(server.blobs.get(hash)).toEqual(bytes);
    expect(storage.confirmedRow('clients', first.rowId)?.version).toBe(1);
  });

  test('when the server rejects one change, then that item shows the reason and the others are still sent', async () => {
    const mutationIds = [randomUUID(), randomUUID(), randomUUID()];
    const reason = 'Date of birth cannot be in the future.';
    const { storage, server, clock, engine } = setup({ reject: new Map([[mutationIds[1], reason]]) });
    const items = mutationIds.map((mutationId, i) =>
      mutationItem({
        mutationId,
        entity: 'clients',
        rowId: randomUUID(),
        baseVersion: 0,
        change: clientChange(`Row${i}`),
        now: i,
      }),
    );
    for (const item of items) await storage.putOutboxItem(item);
    clock.now = 10;

    const report = await engine.sync();
    expect(report).toMatchObject({ sent: 2, failed: 1 });
    const after = await byId(storage);
    expect(after.get(items[0].id)?.state).toBe('sent');
    expect(after.get(items[1].id)).toMatchObject({ state: 'failed', lastError: reason });
    expect(after.get(items[2].id)?.state).toBe('sent');

    // A refused item is not sent again on later runs.
    await engine.sync();
    expect(server.pushedMutationIds.filter((id) => id === mutationIds[1])).toHaveLength(1);
  });

  test('when the server refuses the app version, then the status carries its message and every item keeps waiting', async () => {
    const { storage, engine } = setup({ outdated: true });
    const item = mutationItem({
      mutationId: randomUUID(),
      entity: 'clients',
      rowId: randomUUID(),
      baseVersion: 0,
      change: clientChange('Vesna'),
      now: 0,
    });
    await storage.putOutboxItem(item);
    await engine.sync();
    expect(engine.status.outdated).toBe(OUTDATED_CLIENT_MESSAGE);
    expect((await byId(storage)).get(item.id)).toMatchObject({ state: 'waiting', attempts: 0 });
  });

  test('when every byte of a clip arrives but the server has not stored it, then the clip is not counted as sent until the server says it is stored', async () => {
    const { storage, server, clock, engine } = setup({ unprocessedUploads: 1 });
    const bytes = new Uint8Array([9, 8, 7, 6]);
    const hash = 'cd'.repeat(32);
    storage.putBlob(hash, bytes);
    const clip = clipItem({ id: randomUUID(), rowId: randomUUID(), blobHash: hash, sizeBytes: 4, now: 0 });
    await storage.putOutboxItem(clip);

    const first = await engine.sync();
    expect(first.sent).toBe(0);
    expect(server.calls).toEqual(['blobStatus', 'uploadClip', 'blobStatus', 'pull']);
    expect((await byId(storage)).get(clip.id)).toMatchObject({
      state: 'waiting',
      uploadUrl: `/uploads/${hash}`,
      lastError: expect.stringContaining('not stored yet'),
    });
    expect(server.blobs.has(hash)).toBe(false);

    clock.now = 1_000;
    const second = await engine.sync();
    expect(second.sent).toBe(1);
    expect((await byId(storage)).get(clip.id)).toMatchObject({ state: 'sent', progress: 1 });
    expect(server.blobs.get(hash)).toEqual(bytes);
  });
});
