// One lock per upload across every server process that shares the staging folder, held as a PostgreSQL advisory
// lock. @tus/server's default locker lives in one process's memory, so behind a load balancer two instances
// could write the same upload at once (a device resuming through B while its dead connection still holds A).
//
// Each lock is held on a connection of its own, taken from a small pool kept apart from the application's (a
// PATCH may stream for minutes and must not starve queries). PostgreSQL drops the lock when that connection
// ends, so a crashed instance frees its uploads by itself. A waiter asks the holder to let go (tus's
// `requestRelease`: the holder ends its request, as tus does within one process) by a NOTIFY on the upload's
// channel, which the holder LISTENs to on the same connection.
import { createHash } from 'node:crypto';
import type { Lock, Locker, RequestRelease } from '@tus/utils';
import { Pool, type PoolClient } from 'pg';
import type { Sequelize } from 'sequelize';

/** Namespace (the first key of the two-key advisory lock), so these never meet another use of advisory locks. */
const LOCK_NAMESPACE = 0x4650; // "FP"
const RETRY_MS = 100;

/** Thrown when a lock is still held elsewhere at the deadline; tus sends it as the answer (423, retryable). */
export const LOCK_BUSY = {
  status_code: 423,
  body: JSON.stringify({
    error: {
      code: 'upload_busy',
      message: 'This upload is being written by another request. Try again in a moment.',
    },
  }),
};

// Two ids that share these 32 bits only wait for each other; they never share bytes.
const lockKey = (id: string) => createHash('sha256').update(id).digest().readInt32BE(0);
const channelOf = (id: string) =>
  `fourpoint_upload_${createHash('sha256').update(id).digest('hex').slice(0, 40)}`;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export interface PgLockerOptions {
  /** How long a request waits for an upload another request holds. */
  acquireTimeoutMs?: number;
  /** Connections kept for held locks, per process. */
  poolMax?: number;
}

export class PgUploadLocker implements Locker {
  readonly pool: Pool;
  private readonly acquireTimeoutMs: number;

  constructor(sequelize: Sequelize, options: PgLockerOptions = {}) {
    const { host, port, username, password, database } = sequelize.config;
    this.pool = new Pool({
      host,
      port: Number(port),
      user: username,
      password: password ?? undefined,
      database,
      max: options.poolMax ?? 20,
      idleTimeoutMillis: 10_000,
      // Idle lock connections never keep a process (or a test run) alive.
      allowExitOnIdle: true,
    });
    this.acquireTimeoutMs = options.acquireTimeoutMs ?? 30_000;
  }

  newLock(id: string): Lock {
    return new PgUploadLock(this.pool, id, this.acquireTimeoutMs);
  }

  /** Runs `work` holding the lock on `id` (processing a staged upload once across all instances). */
  async withLock<T>(id: string, work: () => Promise<T>, timeoutMs = this.acquireTimeoutMs): Promise<T> {
    const lock = new PgUploadLock(this.pool, id, timeoutMs);
    await lock.lock(new AbortController().signal, () => undefined);
    try {
      return await work();
    } finally {
      await lock.unlock();
    }
  }

  close(): Promise<void> {
    return this.pool.end();
  }
}

class PgUploadLock implements Lock {
  private client: PoolClient | null = null;
  private onNotification: (() => void) | null = null;

  constructor(
    private readonly pool: Pool,
    private readonly id: string,
    private readonly timeoutMs: number,
  ) {}

  async lock(stopSignal: AbortSignal, requestRelease: RequestRelease): Promise<void> {
    const deadline = Date.now() + this.timeoutMs;
    const client = await this.pool.connect();
    let askedHolder = false;
    try {
      for (;;) {
        const { rows } = await client.query<{ ok: boolean }>('SELECT pg_try_advisory_lock($1, $2) AS ok', [
          LOCK_NAMESPACE,
          lockKey(this.id),
        ]);
        if (rows[0].ok) break;
        if (!askedHolder) {
          await client.query('SELECT pg_notify($1, $2)', [channelOf(this.id), 'release']);
          askedHolder = true;
        }
        if (stopSignal.aborted || Date.now() >= deadline) throw LOCK_BUSY;
        await sleep(RETRY_MS);
      }
      const channel = channelOf(this.id);
      this.onNotification = () => void requestRelease();
      client.on('notification', this.onNotification);
      // A channel name is an identifier, not a parameter; it is hex made here, so quoting it is enough.
      await client.query(`LISTEN "${channel}"`);
      this.client = client;
    } catch (error) {
      client.release();
      throw error;
    }
  }

  async unlock(): Promise<void> {
    const client = this.client;
    if (!client) throw new Error('Releasing an upload lock that is not held.');
    this.client = null;
    try {
      await client.query('UNLISTEN *');
      await client.query('SELECT pg_advisory_unlock($1, $2)', [LOCK_NAMESPACE, lockKey(this.id)]);
      if (this.onNotification) client.removeListener('notification', this.onNotification);
      client.release();
    } catch (error) {
      // A connection that failed mid-unlock is thrown away: closing it drops the lock.
      client.release(error instanceof Error ? error : true);
      throw error;
    }
  }
}
