import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client';
import type { AnalysisPool } from './analysis-pool.js';
import type { AnalysisQueue } from './analysis-queue.js';
import type { Sql } from './database.js';
import type { SampleBudget } from './sample-budget.js';
import { ping } from './store.js';

/*
 * The Prometheus metrics of one service process (prom-client), for the plant's own monitoring: requests and
 * errors by route and status, uploads by outcome, analysis time, the analysis queue, the samples admitted,
 * the database (answers or not, pool size) and the process (memory, CPU, event-loop lag). Counts only: no
 * site, machine or key appears in a label.
 */

export interface ServiceMetrics {
  registry: Registry;
  requests: Counter<'method' | 'route' | 'status'>;
  uploads: Counter<'outcome'>;
  analysisSeconds: Histogram<string>;
}

export function createMetrics(sources: { sql: Sql; analysis: AnalysisPool; budget: SampleBudget; queue: AnalysisQueue; dbPoolMax: number }): ServiceMetrics {
  const registry = new Registry();
  collectDefaultMetrics({ register: registry, prefix: 'kinespec_' });
  const requests = new Counter({
    name: 'kinespec_http_requests_total',
    help: 'HTTP requests answered, by method, route template and status',
    labelNames: ['method', 'route', 'status'] as const,
    registers: [registry],
  });
  const uploads = new Counter({
    name: 'kinespec_uploads_total',
    help: 'Recording uploads by outcome: stored (new), duplicate (a retry answered with the first result), refused (4xx), failed (5xx)',
    labelNames: ['outcome'] as const,
    registers: [registry],
  });
  const analysisSeconds = new Histogram({
    name: 'kinespec_analysis_duration_seconds',
    help: 'Wall time of one analysis, including the wait for a thread',
    buckets: [0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60],
    registers: [registry],
  });
  new Gauge({
    name: 'kinespec_analysis_queue_depth',
    help: 'Analyses waiting for a thread and running',
    labelNames: ['state'] as const,
    registers: [registry],
    collect() {
      const d = sources.analysis.depth;
      this.set({ state: 'waiting' }, d.waiting);
      this.set({ state: 'running' }, d.running);
    },
  });
  new Gauge({
    name: 'kinespec_queue_jobs_waiting',
    help: 'Analysis jobs in the PostgreSQL queue not yet taken by a worker (all processes; -1 when the database does not answer)',
    registers: [registry],
    async collect() {
      this.set(await sources.queue.depth().catch(() => -1));
    },
  });
  new Gauge({
    name: 'kinespec_analysis_samples_in_flight',
    help: 'Samples admitted into analysis now (KINESPEC_MAX_ANALYSIS_SAMPLES bounds it)',
    registers: [registry],
    collect() {
      this.set(sources.budget.samplesInFlight);
    },
  });
  new Gauge({
    name: 'kinespec_db_pool_max_connections',
    help: 'Connections the database pool may open',
    registers: [registry],
    collect() {
      this.set(sources.dbPoolMax);
    },
  });
  new Gauge({
    name: 'kinespec_db_up',
    help: '1 when the database answered a ping at this scrape (within 2 s), else 0',
    registers: [registry],
    async collect() {
      const answered = await Promise.race([
        ping(sources.sql).then(() => true, () => false),
        new Promise<boolean>((r) => setTimeout(() => r(false), 2_000).unref()),
      ]);
      this.set(answered ? 1 : 0);
    },
  });
  return { registry, requests, uploads, analysisSeconds };
}
