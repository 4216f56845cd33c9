// What GET /api/health/ready answers, kept fresh in the background. The route itself asks nothing: under load
// every pooled connection may be busy with pushes, and a check that queued behind them timed out and took a
// busy but working instance out of the load balancer. So a probe asks the database over a connection of its own
// (a pool of one, outside the request pool) and the blob store, every PROBE_INTERVAL_MS, each within
// PROBE_TIMEOUT_MS, and the route answers from its latest result.
//
// Slow is not down: on a starved machine (the tests', at a load of 30 on two cores) a SELECT 1 can take seconds,
// and every instance shares that database, so taking them out helps no one. A part is down when it refuses or
// fails (connection refused, an error), or when it has not answered at all for SLOW_GRACE_MS (a hung network).
import pg from 'pg';

export const PROBE_INTERVAL_MS = 1000;
/** Below HAProxy's `timeout check` (5 s, balancer.mjs), so the first check, which waits for a probe, is answered. */
export const PROBE_TIMEOUT_MS = 4000;
export const SLOW_GRACE_MS = 20_000;

export interface ReadinessState {
  db: boolean;
  storage: boolean;
}

/** 'up', 'down' (refused or failed), or 'slow' when `work` has not settled within `ms`. */
function outcome(ms: number, work: Promise<unknown>): Promise<'up' | 'down' | 'slow'> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<'slow'>((resolve) => {
    timer = setTimeout(() => resolve('slow'), ms);
  });
  return Promise.race([
    work.then(
      () => 'up' as const,
      () => 'down' as const,
    ),
    timeout,
  ]).finally(() => clearTimeout(timer));
}

/** One part's answer over time: up while it answers, or has been slow for less than SLOW_GRACE_MS. */
class PartState {
  private lastUp = -Infinity;
  up = false;

  record(result: 'up' | 'down' | 'slow'): boolean {
    const now = Date.now();
    if (result === 'up') this.lastUp = now;
    this.up = result === 'up' || (result === 'slow' && now - this.lastUp < SLOW_GRACE_MS);
    return this.up;
  }
}

export class ReadinessProbe {
  private readonly pool: pg.Pool;
  private latest: ReadinessState | null = null;
  private probing: Promise<ReadinessState> | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;
  private readonly db = new PartState();
  private readonly storage = new PartState();

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
        outcome(PROBE_TIMEOUT_MS, this.pool.query('SELECT 1')),
        outcome(PROBE_TIMEOUT_MS, this.storageAnswers()),
      ]);
      this.latest = { db: this.db.record(db), storage: this.storage.record(storage) };
      return this.latest;
    })().finally(() => {
      this.probing = null;
    });
    return this.probing;
  }
}
