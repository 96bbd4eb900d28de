import type { Recording } from '@kinespec/signal';
import type { AnalysisPool } from './analysis-pool.js';
import type { MachineModel } from '@kinespec/kinematics';
import type { analyse, RecordingAnalysis } from './analysis.js';
import { analysisRow, velocityLevels } from './analysis-row.js';
import { evaluateAlarms } from './alarms.js';
import type { AnalysisJobData, JobContext } from './analysis-queue.js';
import type { Sql } from './database.js';
import { runAnalysis } from './ingest.js';
import type { ServiceMetrics } from './metrics.js';
import type { ModelCache } from './model-cache.js';
import { ProblemError } from './problems.js';
import { unpackSamples } from './samples-codec.js';
import {
  ensureTrendMonth,
  getAnalysisState,
  getReanalysis,
  reanalysisItemDone,
  recordReanalysisItem,
  getPointById,
  getRecordingSamples,
  insertAnalysis,
  lockPoint,
  modelVersionAt,
  recordingForAnalysis,
  setAnalysisState,
  writeTrendValues,
  type PointRow,
  type RecordingRow,
} from './store.js';

/*
 * One job of the analysis queue: analyse a stored recording against the machine's model version of its time,
 * then in one transaction (the point locked) store the analysis, its trend values and alarms and mark the
 * recording 'done'. A recording the packages refuse (too short, not a vibration unit) is marked 'failed' with
 * the problem the upload answers; nothing is retried for it. Any other error is thrown, so that the queue
 * retries the job; on its last try the recording is marked 'failed' (internal-error) before the error goes on.
 * A job repeated after its worker died (pg-boss expiry) finds the recording 'done' and stops: no second analysis.
 */

export interface JobServices {
  sql: Sql;
  models: ModelCache;
  analysis: AnalysisPool;
  metrics?: ServiceMetrics;
}

/** A job of the queue: an upload's first analysis, or one recording of a machine's re-analysis. */
export async function runAnalysisJob(services: JobServices, job: AnalysisJobData, context: JobContext): Promise<void> {
  if (job.reanalysisId) await reanalyseRecording(services, job.reanalysisId, job.recordingId);
  else await analyseQueuedRecording(services, job.recordingId, context);
}

export async function analyseQueuedRecording(services: JobServices, recordingId: string, context: JobContext): Promise<void> {
  const { sql } = services;
  const row = await recordingForAnalysis(sql, recordingId);
  if (!row || row.state !== 'queued') return;
  try {
    const point = await getPointById(sql, row.pointId);
    if (!point) return;
    const modelVersion = await modelVersionAt(sql, row.machineId, row.recordedAt);
    const model = modelVersion === null ? null : await services.models.get(sql, row.machineId, modelVersion);
    const recording = context.local ?? (await storedRecording(sql, recordingId, row));
    if (!recording) return;
    const t0 = performance.now();
    let analysis: RecordingAnalysis;
    try {
      analysis = await runAnalysis(services.analysis, recording, analysisOptions(row, point, model));
    } catch (err) {
      if (err instanceof ProblemError && err.problem.slug === 'analysis-failed') {
        await setAnalysisState(sql, recordingId, 'failed', { slug: 'analysis-failed', detail: err.detail, ...(typeof err.extras['code'] === 'string' ? { code: err.extras['code'] } : {}) });
        return;
      }
      throw err;
    }
    services.metrics?.analysisSeconds.observe((performance.now() - t0) / 1000);
    const stored = analysisRow(recordingId, modelVersion, analysis);
    await ensureTrendMonth(sql, row.recordedAt);
    await sql.begin(async (tx) => {
      await lockPoint(tx, row.pointId);
      // a repeated job (its first worker died after storing) must not analyse twice
      const now = await getAnalysisState(tx, recordingId);
      if (now?.state !== 'queued') return;
      const inserted = await insertAnalysis(tx, stored);
      await writeTrendValues(tx, { pointId: row.pointId, recordingId, analysisId: inserted.id, recordedAt: row.recordedAt, indicators: analysis.indicators });
      await evaluateAlarms(tx, { siteId: row.siteId, point, recordingId, recordedAt: row.recordedAt, indicators: analysis.indicators, velocityLevels: velocityLevels(analysis) });
      await setAnalysisState(tx, recordingId, 'done');
    });
  } catch (err) {
    if (context.lastAttempt) {
      await setAnalysisState(sql, recordingId, 'failed', { slug: 'internal-error', detail: 'the analysis failed on every try; the service log holds the details' }).catch(() => {});
    }
    throw err;
  }
}

/**
 * One recording of a re-analysis: analysed again against the re-analysis's model version and made current, or
 * recorded as failed with the reason (samples dropped by the retention setting, input the packages refuse).
 * A repeated job finds its item recorded and does nothing.
 */
async function reanalyseRecording(services: JobServices, reanalysisId: string, recordingId: string): Promise<void> {
  const { sql } = services;
  if (await reanalysisItemDone(sql, reanalysisId, recordingId)) return;
  const batch = await getReanalysis(sql, null, reanalysisId);
  const row = await recordingForAnalysis(sql, recordingId);
  if (!batch || !row) return;
  const fail = (reason: string) => sql.begin((tx) => recordReanalysisItem(tx, reanalysisId, recordingId, reason));
  if (row.samplesPurgedAt) {
    await fail(`its raw samples were dropped on ${row.samplesPurgedAt.toISOString().slice(0, 10)} (KINESPEC_SAMPLE_RETENTION_DAYS); its earlier analysis stays current`);
    return;
  }
  const point = await getPointById(sql, row.pointId);
  const model = await services.models.get(sql, row.machineId, batch.modelVersion);
  const recording = await storedRecording(sql, recordingId, row);
  if (!point || !recording) return;
  let analysis: RecordingAnalysis;
  try {
    analysis = await runAnalysis(services.analysis, recording, analysisOptions(row, point, model));
  } catch (err) {
    if (err instanceof ProblemError && err.problem.slug === 'analysis-failed') {
      await fail(err.detail);
      return;
    }
    throw err;
  }
  const stored = analysisRow(recordingId, batch.modelVersion, analysis);
  await ensureTrendMonth(sql, row.recordedAt);
  await sql.begin(async (tx) => {
    await lockPoint(tx, row.pointId);
    // the item first: a repeated job stops here, and nothing below is written twice
    if (!(await recordReanalysisItem(tx, reanalysisId, recordingId, null))) return;
    const inserted = await insertAnalysis(tx, stored);
    await writeTrendValues(tx, { pointId: row.pointId, recordingId, analysisId: inserted.id, recordedAt: row.recordedAt, indicators: analysis.indicators });
    await evaluateAlarms(tx, { siteId: row.siteId, point, recordingId, recordedAt: row.recordedAt, indicators: analysis.indicators, velocityLevels: velocityLevels(analysis) });
  });
}

/**
 * How a stored recording is analysed at a point: against `model`, with the speed given at upload and the channel
 * the upload named (1-based in the store, 0-based for the analysis). The first analysis, a re-analysis and a
 * correction's move all ask alike.
 */
export function analysisOptions(
  row: Pick<RecordingRow, 'speedRpm' | 'analysisChannel'>,
  point: Pick<PointRow, 'pointKey'>,
  model: MachineModel | null,
): Parameters<typeof analyse>[1] {
  return {
    model,
    pointId: point.pointKey,
    ...(row.speedRpm !== null ? { speedRpm: row.speedRpm } : {}),
    ...(row.analysisChannel !== null ? { channel: row.analysisChannel - 1 } : {}),
  };
}

/** A stored recording with its samples (float32, as stored), or null when they are gone. */
export async function storedRecording(sql: Sql, recordingId: string, row: { sampleRateHz: number; metadata: Record<string, string>; channels: Array<{ name: string; unit: string }> }): Promise<Recording | null> {
  const bytes = await getRecordingSamples(sql, recordingId);
  if (!bytes) return null;
  const channels = unpackSamples(bytes, row.channels.length);
  return {
    sampleRateHz: row.sampleRateHz,
    metadata: row.metadata,
    channels: row.channels.map((c, i) => ({ name: c.name, unit: c.unit, samples: channels[i]! })),
  };
}
