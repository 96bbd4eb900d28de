import PgBoss from 'pg-boss';
import type { Recording } from '@kinespec/signal';
import type { Database, Queryable, Sql } from './database.js';
import { getAnalysisState, type AnalysisState } from './store.js';

/*
 * The analysis queue: one job per stored recording, kept in PostgreSQL by pg-boss (a maintained queue
 * library: SKIP LOCKED fetches, retries with back-off, expiry of jobs whose worker died). The job is sent in
 * the same transaction that stores the recording, so a recording is never stored without its job nor a job
 * queued for a recording that was rolled back.
 *
 * Server mode: pg-boss has its own small pool to DATABASE_URL (its migrations and maintenance open explicit
 * transactions, which a shared postgres.js pool refuses). Embedded mode: pg-boss runs over the one PGlite
 * connection through its `db` adapter, in the same process: the same queue, tables and retries, no second
 * connection (PGlite serves one).
 *
 * Workers (this process's, `kinespec worker` processes elsewhere) fetch jobs; a worker in the same process
 * as the upload is woken at once (kick) and may take the decoded recording from memory (offerLocal) instead
 * of reading the samples back. The upload waits a short while for the analysis (waitFor): local workers tell
 * it at once, others through the recording's analysis_state, read every pollMs.
 */

export const ANALYSIS_QUEUE = 'kinespec-analysis';

export interface AnalysisJobData {
  recordingId: string;
}

export interface JobContext {
  /** True on the job's last try: a handler that fails now should record the failure for good. */
  lastAttempt: boolean;
  /** The decoded recording when the upload happened in this process (samples already float32-rounded). */
  local: Recording | null;
}

export type JobHandler = (recordingId: string, context: JobContext) => Promise<void>;

export interface QueueOptions {
  /** A job whose worker went silent this long is retried (pg-boss expiry): the analysis time limit and some. */
  expireInSeconds: number;
  /** Tries after the first. */
  retryLimit?: number;
  onError?: (err: Error) => void;
}

const LOCAL_OFFER_MS = 120_000;

function undefinedToNull(values: unknown[]): never[] {
  return values.map((v) => (v === undefined ? null : v)) as never[];
}

/** pg-boss's `db` adapter over a postgres.js pool or transaction. */
function adapter(sql: Queryable): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const rows = values.length > 0 ? await sql.unsafe(text, undefinedToNull(values)) : await sql.unsafe(text);
      return { rows: [...rows] };
    },
  };
}

export class AnalysisQueue {
  private readonly local = new Map<string, { recording: Recording; at: number }>();
  private readonly waiters = new Map<string, Set<() => void>>();
  private wake: Array<() => void> = [];
  private loops: Promise<void>[] = [];
  private stopped = false;
  private localWorkers = 0;

  private constructor(private readonly boss: PgBoss, private readonly sql: Sql) {}

  static async start(db: Pick<Database, 'sql' | 'connectionString'>, options: QueueOptions): Promise<AnalysisQueue> {
    const common = {
      schedule: false,
      supervise: true,
      maintenanceIntervalSeconds: 30,
      expireInSeconds: options.expireInSeconds,
      retryLimit: options.retryLimit ?? 3,
      retryDelay: 2,
      retryBackoff: true,
    };
    const boss = db.connectionString
      ? new PgBoss({ ...common, connectionString: db.connectionString, max: 4, application_name: 'kinespec-queue' } as PgBoss.ConstructorOptions)
      : new PgBoss({ ...common, db: adapter(db.sql) });
    // pg-boss reports connection trouble as events; unheard, an 'error' event would end the process
    boss.on('error', (err) => options.onError?.(err));
    await boss.start();
    await boss.createQueue(ANALYSIS_QUEUE, {
      name: ANALYSIS_QUEUE,
      policy: 'standard',
      retryLimit: options.retryLimit ?? 3,
      retryDelay: 2,
      retryBackoff: true,
      expireInSeconds: options.expireInSeconds,
    });
    return new AnalysisQueue(boss, db.sql);
  }

  /** Queues the analysis of a recording inside the caller's transaction (the one that stores the recording). */
  async enqueueIn(tx: Queryable, recordingId: string): Promise<void> {
    await this.boss.send(ANALYSIS_QUEUE, { recordingId } satisfies AnalysisJobData, { db: adapter(tx) });
  }

  /** After the commit: the decoded recording for a worker of this process, which is woken. */
  offerLocal(recordingId: string, recording: Recording): void {
    const now = Date.now();
    for (const [id, entry] of this.local) if (now - entry.at > LOCAL_OFFER_MS) this.local.delete(id);
    if (this.localWorkers > 0) this.local.set(recordingId, { recording, at: now });
    this.kick();
  }

  /** Wakes idle local workers (a job was just queued). */
  kick(): void {
    const wake = this.wake;
    this.wake = [];
    for (const w of wake) w();
  }

  /** Runs `concurrency` worker loops in this process. */
  startWorkers(concurrency: number, handler: JobHandler, pollMs = 1_000): void {
    this.localWorkers += concurrency;
    for (let i = 0; i < concurrency; i++) this.loops.push(this.loop(handler, pollMs));
  }

  private async loop(handler: JobHandler, pollMs: number): Promise<void> {
    while (!this.stopped) {
      let jobs: PgBoss.JobWithMetadata<AnalysisJobData>[];
      try {
        jobs = await this.boss.fetch<AnalysisJobData>(ANALYSIS_QUEUE, { batchSize: 1, includeMetadata: true });
      } catch {
        // the database is away: try again after a pause
        await this.idle(pollMs);
        continue;
      }
      const job = jobs[0];
      if (!job) {
        await this.idle(pollMs);
        continue;
      }
      const recordingId = job.data.recordingId;
      const offered = this.local.get(recordingId);
      this.local.delete(recordingId);
      try {
        await handler(recordingId, { lastAttempt: job.retryCount >= job.retryLimit, local: offered?.recording ?? null });
        await this.boss.complete(ANALYSIS_QUEUE, job.id).catch(() => {});
      } catch (err) {
        await this.boss.fail(ANALYSIS_QUEUE, job.id, { message: err instanceof Error ? err.message : String(err) }).catch(() => {});
      } finally {
        this.notify(recordingId);
      }
    }
  }

  private idle(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const timer = setTimeout(done, ms);
      function done() {
        clearTimeout(timer);
        resolve();
      }
      this.wake.push(done);
    });
  }

  /** Tells waiters of this process that a recording's job has run (whatever its outcome). */
  notify(recordingId: string): void {
    const set = this.waiters.get(recordingId);
    if (!set) return;
    this.waiters.delete(recordingId);
    for (const w of set) w();
  }

  /**
   * Waits up to `ms` for a recording's analysis to be stored or to fail, reading its state when a local worker
   * says so or every `pollMs` (workers of other processes). Returns the state at the end of the wait.
   */
  async waitFor(recordingId: string, ms: number, pollMs = 100): Promise<AnalysisState> {
    const deadline = Date.now() + ms;
    for (;;) {
      const row = await getAnalysisState(this.sql, recordingId);
      if (!row || row.state !== 'queued') return row?.state ?? 'failed';
      const left = deadline - Date.now();
      if (left <= 0) return 'queued';
      await new Promise<void>((resolve) => {
        const set = this.waiters.get(recordingId) ?? new Set();
        const done = () => {
          clearTimeout(timer);
          set.delete(done);
          resolve();
        };
        const timer = setTimeout(done, Math.min(left, this.localWorkers > 0 ? 5 * pollMs : pollMs));
        set.add(done);
        this.waiters.set(recordingId, set);
      });
    }
  }

  /** Jobs queued (created or waiting for a retry) and not yet taken by a worker. */
  async depth(): Promise<number> {
    return this.boss.getQueueSize(ANALYSIS_QUEUE);
  }

  get workers(): number {
    return this.localWorkers;
  }

  /** Stops the local workers after their current job, then pg-boss. */
  async close(): Promise<void> {
    this.stopped = true;
    this.kick();
    await Promise.all(this.loops);
    await this.boss.stop({ graceful: true, wait: true, timeout: 5_000 } as PgBoss.StopOptions).catch(() => {});
  }
}
