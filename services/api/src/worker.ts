import { pino, type Logger } from 'pino';
import { runAnalysisJob } from './analysis-job.js';
import { AnalysisPool } from './analysis-pool.js';
import { AnalysisQueue } from './analysis-queue.js';
import { ConfigError, type ServiceConfig } from './config.js';
import { openDatabase } from './database.js';
import { pendingMigrations } from './migrate.js';
import { ModelCache } from './model-cache.js';

/*
 * A worker process (`kinespec worker`): analyses jobs of the PostgreSQL queue and serves no HTTP. Any number
 * run beside the API replicas, on this machine or others; each job goes to one of them (pg-boss's SKIP LOCKED
 * fetch), and a job whose worker dies is retried by another once it expires. Only for a PostgreSQL server:
 * the embedded database serves one process, which analyses its own queue.
 */

export interface RunningWorker {
  close(): Promise<void>;
}

const MIGRATION_WAIT_MS = 120_000;

export async function startWorker(config: ServiceConfig, options: { logger?: Logger; out?: (text: string) => void } = {}): Promise<RunningWorker> {
  if (!config.databaseUrl) throw new ConfigError('kinespec worker needs DATABASE_URL (a PostgreSQL server); the embedded database is analysed by `kinespec serve` itself');
  const logger = options.logger ?? pino({ level: config.logLevel, name: 'kinespec-worker' });
  const db = await openDatabase({ databaseUrl: config.databaseUrl, dataDir: '', poolMax: Math.min(config.dbPoolMax, 4) });
  try {
    // the API replicas apply migrations; a worker waits until the schema is current
    const started = Date.now();
    for (;;) {
      const pending = await pendingMigrations(db.sql).catch(() => ['(database not reachable)']);
      if (pending.length === 0) break;
      if (Date.now() - started > MIGRATION_WAIT_MS) throw new ConfigError(`the database's migrations are not current (${pending.join(', ')}); start \`kinespec serve\` first`);
      await new Promise((r) => setTimeout(r, 1_000));
    }
    const analysis = new AnalysisPool(config.analysisThreads, 256, config.analysisTimeoutMs);
    const queue = await AnalysisQueue.start(db, {
      expireInSeconds: Math.ceil(config.analysisTimeoutMs / 1000) + 30,
      onError: (err) => logger.warn({ err: err.message }, 'analysis queue'),
    });
    const services = { sql: db.sql, models: new ModelCache(), analysis };
    const workers = Math.max(1, config.queueWorkers);
    queue.startWorkers(workers, (job, context) => runAnalysisJob(services, job, context));
    options.out?.(`Kinespec worker: analysing queued recordings (${workers} at once, ${analysis.threads} thread(s)) from ${db.location}`);
    return {
      async close() {
        await queue.close();
        await analysis.close();
        await db.close();
      },
    };
  } catch (err) {
    await db.close().catch(() => {});
    throw err;
  }
}
