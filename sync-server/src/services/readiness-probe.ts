// What GET /api/health/ready answers, kept fresh in the background. The route itself asks nothing: under load
// every pooled connection may be busy with pushes, and a check that queued behind them timed out and took a
// busy but working instance out of the load balancer. So a probe asks the database over a connection of its own
// (a pool of one, outside the request pool) and the blob store, every PROBE_INTERVAL_MS, each within
// PROBE_TIMEOUT_MS, and the route answers from its latest result.
import pg from 'pg';

export const PROBE_INTERVAL_MS = 1000;
export const PROBE_TIMEOUT_MS = 2000;

export interface ReadinessState {
  db: boolean;
  storage: boolean;
}

/** Rejects when `work` has not settled within `ms` (a hung socket must not keep the last answer forever). */
function within<T>(ms: number, work: Promise<T>): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms);
  });
  return Promise.race([work, timeout]).finally(() => clearTimeout(timer));
}

export class ReadinessProbe {
  private readonly pool: pg.Pool;
  private latest: ReadinessState | null = null;
  private probing: Promise<ReadinessState> | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;

  constructor(
    connection: pg.PoolConfig,
    private readonly storageAnswers: () => Promise<unknown>,
  ) {
    this.pool = new pg.Pool({
      ...connection,
      max: 1,
      connectionTimeoutMillis: PROBE_TIMEOUT_MS,
      query_timeout: PROBE_TIMEOUT_MS,
      application_name: 'fourpoint-readiness',
      // The idle connection does not keep a process alive (tests, a CLI that built an app).
      allowExitOnIdle: true,
    });
    // A dropped idle connection is reported here; the next probe opens a new one and says "down" if it cannot.
    this.pool.on('error', () => undefined);
  }

  /** The latest result; the first call waits for the first probe and starts the background loop. */
  async current(): Promise<ReadinessState> {
    if (this.latest) return this.latest;
    const first = await this.probe();
    this.scheduleNext();
    return first;
  }

  /** Stops the loop and closes the probe's connection. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    await this.probing?.catch(() => undefined);
    await this.pool.end().catch(() => undefined);
  }

  private scheduleNext(): void {
    if (this.stopped || this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.probe().finally(() => this.scheduleNext());
    }, PROBE_INTERVAL_MS);
    this.timer.unref();
  }

  private probe(): Promise<ReadinessState> {
    this.probing ??= (async () => {
      const [db, storage] = await Promise.all([
        within(PROBE_TIMEOUT_MS, this.pool.query('SELECT 1')).then(
          () => true,
          () => false,
        ),
        within(PROBE_TIMEOUT_MS, this.storageAnswers()).then(
          () => true,
          () => false,
        ),
      ]);
      this.latest = { db, storage };
      return this.latest;
    })().finally(() => {
      this.probing = null;
    });
    return this.probing;
  }
}
