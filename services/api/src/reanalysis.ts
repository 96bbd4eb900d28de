import type { Recording } from '@kinespec/signal';
import type { RecordingAnalysis } from './analysis.js';
import { analysisRow, velocityLevels } from './analysis-row.js';
import { evaluateAlarms } from './alarms.js';
import type { Sql } from './database.js';
import { runAnalysis } from './ingest.js';
import type { AnalysisPool } from './analysis-pool.js';
import type { ModelCache } from './model-cache.js';
import { problem } from './problems.js';
import { unpackSamples } from './samples-codec.js';
import {
  getPointById,
  getRecording,
  getRecordingSamples,
  insertAnalysis,
  listMachineRecordingIds,
  lockPoint,
  writeTrendValues,
  type MachineRow,
  type PointRow,
} from './store.js';

/**
 * Analyses every stored recording of a machine again against its current model version. Each new
 * analysis becomes current; the earlier ones stay, with the model and software versions that made them.
 * Recordings are done one at a time, each in its own transaction, oldest first.
 */
export async function reanalyseMachine(
  { sql, models, analysis: pool }: { sql: Sql; models: ModelCache; analysis: AnalysisPool },
  machine: MachineRow,
): Promise<{ analysed: number; failed: Array<{ recordingId: string; reason: string }>; modelVersion: number }> {
  const version = machine.currentModelVersion;
  if (version === null) throw problem('no-machine-model', `machine '${machine.machineKey}' has no model version yet`);
  const model = await models.get(sql, machine.id, version);
  const points = new Map<number, PointRow>();
  const failed: Array<{ recordingId: string; reason: string }> = [];
  let analysed = 0;
  for (const { id, pointId } of await listMachineRecordingIds(sql, machine.id)) {
    let point = points.get(pointId);
    if (!point) {
      point = (await getPointById(sql, pointId))!;
      points.set(pointId, point);
    }
    const row = await getRecording(sql, machine.siteId, id);
    if (row?.samplesPurgedAt) {
      failed.push({ recordingId: id, reason: `its raw samples were dropped on ${row.samplesPurgedAt.toISOString().slice(0, 10)} (KINESPEC_SAMPLE_RETENTION_DAYS); its earlier analysis stays current` });
      continue;
    }
    const bytes = await getRecordingSamples(sql, id);
    if (!row || !bytes) continue;
    const channels = unpackSamples(bytes, row.channels.length);
    const recording: Recording = {
      sampleRateHz: row.sampleRateHz,
      metadata: row.metadata,
      channels: row.channels.map((c, i) => ({ name: c.name, unit: c.unit, samples: channels[i]! })),
    };
    let analysis: RecordingAnalysis;
    try {
      analysis = await runAnalysis(pool, recording, { model, pointId: point.pointKey, pointUnit: point.unit, ...(row.speedRpm !== null ? { speedRpm: row.speedRpm } : {}) });
    } catch (err) {
      failed.push({ recordingId: id, reason: err instanceof Error ? err.message : String(err) });
      continue;
    }
    const p = point;
    await sql.begin(async (tx) => {
      await lockPoint(tx, pointId);
      const stored = await insertAnalysis(tx, analysisRow(id, version, analysis));
      await writeTrendValues(tx, { pointId, recordingId: id, analysisId: stored.id, recordedAt: row.recordedAt, indicators: analysis.indicators });
      await evaluateAlarms(tx, { siteId: machine.siteId, point: p, recordingId: id, recordedAt: row.recordedAt, indicators: analysis.indicators, velocityLevels: velocityLevels(analysis) });
    });
    analysed++;
  }
  return { analysed, failed, modelVersion: version };
}
