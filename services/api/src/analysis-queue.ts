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
  /** Set for a job of a machine's re-analysis (reanalysis.ts): analyse again against that request's model version. */
  reanalysisId?: string;
}

export interface JobContext {
  /** True on the job's last try: a handler that fails now should record the failure for good. */
  lastAttempt: boolean;
  /** The decoded recording when the upload happened in this process (samples already float32-rounded). */
  local: Recording | null;
}

export type JobHandler = (job: AnalysisJobData, context: JobContext) => Promise<void>;

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
  /** Counts kicks, so that a loop whose fetch raced a kick (found nothing, then the job committed) does not sleep. */
  private kicks = 0;
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

  /**
   * Queues the jobs of a re-analysis inside the caller's transaction, one per recording. One send each: pg-boss's
   * bulk insert passes its jobs as one JSON text parameter, which postgres.js would encode as JSON a second time.
   */
  async enqueueReanalysisIn(tx: Queryable, reanalysisId: string, recordingIds: readonly string[]): Promise<void> {
    const db = adapter(tx);
    for (const recordingId of recordingIds) {
      await this.boss.send(ANALYSIS_QUEUE, { recordingId, reanalysisId } satisfies AnalysisJobData, { db });
    }
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
    this.kicks++;
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
      const kicksBefore = this.kicks;
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
        // a job queued while the fetch ran woke nobody: look again at once
        if (this.kicks === kicksBefore) await this.idle(pollMs);
        continue;
      }
      const recordingId = job.data.recordingId;
      const offered = job.data.reanalysisId ? undefined : this.local.get(recordingId);
      if (offered) this.local.delete(recordingId);
      try {
        await handler(job.data, { lastAttempt: job.retryCount >= job.retryLimit, local: offered?.recording ?? null });
        await this.boss.complete(ANALYSIS_QUEUE, job.id).catch(() => {});
      } catch (err) {
        await this.boss.fail(ANALYSIS_QUEUE, job.id, { message: err instanceof Error ? err.message : String(err) }).catch(() => {});
      } finally {
        this.notify(job.data.reanalysisId ?? recordingId);
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
    let state: AnalysisState = 'queued';
    await this.waitUntil(recordingId, ms, async () => {
      const row = await getAnalysisState(this.sql, recordingId);
      state = row?.state ?? 'failed';
      return state !== 'queued';
    }, pollMs);
    return state;
  }

  /**
   * Waits up to `ms` until `done()` holds, asking it again whenever a local job of `key` (a recording id, or
   * a re-analysis id for its jobs) has run, else every `pollMs`. Returns the last answer of `done()`.
   */
  async waitUntil(key: string, ms: number, done: () => Promise<boolean>, pollMs = 100): Promise<boolean> {
    const deadline = Date.now() + ms;
    for (;;) {
      if (await done()) return true;
      const left = deadline - Date.now();
      if (left <= 0) return false;
      await new Promise<void>((resolve) => {
        const set = this.waiters.get(key) ?? new Set();
        const wake = () => {
          clearTimeout(timer);
          set.delete(wake);
          resolve();
        };
        const timer = setTimeout(wake, Math.min(left, this.localWorkers > 0 ? 5 * pollMs : pollMs));
        set.add(wake);
        this.waiters.set(key, set);
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
