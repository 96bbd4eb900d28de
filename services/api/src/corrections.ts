import { actorName } from './auth.js';
import { reevaluatePointAlarms } from './alarms.js';
import type { RecordingAnalysis } from './analysis.js';
import type { AnalysisPool } from './analysis-pool.js';
import { analysisOptions, storedRecording } from './analysis-job.js';
import { analysisRow } from './analysis-row.js';
import type { Queryable, Sql } from './database.js';
import { runAnalysis, summarise, type AnalysisSummary } from './ingest.js';
import type { ModelCache } from './model-cache.js';
import { problem } from './problems.js';
import type { SampleBudget } from './sample-budget.js';
import {
  clearAlarmsRaisedBy,
  deleteRecordingRow,
  ensureTrendMonth,
  findMachine,
  findPoint,
  getPointById,
  getRecording,
  insertAnalysis,
  insertAuditEntry,
  lockPoint,
  modelVersionAt,
  moveRecordingRow,
  rebuildTrendDay,
  recordingIdentity,
  setAnalysisState,
  writeTrendValues,
  type ApiKeyRow,
  type AuditEntry,
  type PointRow,
} from './store.js';

/*
 * Corrections an engineer makes to stored recordings: delete one uploaded by mistake, or move one to the point
 * or time it really belongs to. Each is one transaction that also fixes what depended on the recording (the
 * daily trend roll-ups of the days it leaves and joins, the alarms of the points it leaves and joins) and
 * writes an audit entry: who (the key's label and id), when, what it was before and after, and why.
 */

type CorrectionServices = { sql: Sql; models: ModelCache; analysis: AnalysisPool; budget?: SampleBudget };

async function recordingOnSite(sql: Sql, siteId: string, recordingId: string) {
  const row = await getRecording(sql, siteId, recordingId);
  if (!row) throw problem('not-found', `no recording '${recordingId}' on this site`);
  return row;
}

/** Locks the points in id order, so that two corrections touching the same pair never wait on each other. */
async function lockPoints(tx: Queryable, ids: number[]): Promise<void> {
  for (const id of [...new Set(ids)].sort((a, b) => a - b)) await lockPoint(tx, id);
}

export async function deleteRecording(
  { sql }: CorrectionServices,
  key: ApiKeyRow,
  recordingId: string,
  reason: string,
): Promise<AuditEntry> {
  const row = await recordingOnSite(sql, key.siteId, recordingId);
  const point = (await getPointById(sql, row.pointId))!;
  return sql.begin(async (tx) => {
    await lockPoints(tx, [row.pointId]);
    const before = await recordingIdentity(tx, row.id);
    if (!before) throw problem('not-found', `no recording '${recordingId}' on this site`);
    const now = new Date();
    const why = `recording ${row.id} deleted`;
    // the alarms it raised are withdrawn while they still name it (deleting sets their recording to null)
    await clearAlarmsRaisedBy(tx, row.pointId, row.id, now, `correction: ${why}`);
    if (!(await deleteRecordingRow(tx, row.id))) throw problem('not-found', `no recording '${recordingId}' on this site`);
    await rebuildTrendDay(tx, row.pointId, row.recordedAt);
    await reevaluatePointAlarms(tx, { siteId: key.siteId, point, at: now, why });
    return insertAuditEntry(tx, { siteId: key.siteId, recordingId: row.id, action: 'delete', byKeyId: key.id, by: actorName(key), reason, before, after: null });
  });
}

export interface MoveRequest {
  machineId?: string;
  pointId?: string;
  recordedAt?: Date;
  reason: string;
}

export interface MoveResult {
  audit: AuditEntry;
  analysis: AnalysisSummary;
}

/**
 * Moves a recording to another point (of the same or another machine of the site) and/or another time, and
 * analyses it again against the model of its new machine current at its new time: the evidence of a recording
 * depends on the point it was taken at. The analysis runs here, as a queued job's does (the same analysis pool,
 * sample budget and row builder, analysis-row.ts), so that the answer carries it; the recording is then 'done',
 * and a job still queued for it finds that and stops.
 */
export async function moveRecording(services: CorrectionServices, key: ApiKeyRow, recordingId: string, move: MoveRequest): Promise<MoveResult> {
  const { sql, models, analysis: pool } = services;
  const row = await recordingOnSite(sql, key.siteId, recordingId);
  const from = (await getPointById(sql, row.pointId))!;
  const machineKey = move.machineId ?? row.machineKey;
  const machine = await findMachine(sql, key.siteId, machineKey);
  if (!machine) throw problem('not-found', `no machine '${machineKey}' on this site`);
  const pointKey = move.pointId ?? (machineKey === row.machineKey ? row.pointKey : undefined);
  if (pointKey === undefined) throw problem('validation-failed', 'body.pointId: name the point of the other machine to move to', { errors: [{ path: 'body.pointId', message: 'required when the machine changes' }] });
  const to: PointRow | null = await findPoint(sql, machine.id, pointKey);
  if (!to) throw problem('not-found', `machine '${machineKey}' has no point '${pointKey}'`);
  if (to.quantity === 'tach' || to.quantity === 'encoder') throw problem('validation-failed', `body.pointId: '${pointKey}' is a ${to.quantity} point; move vibration recordings to a vibration point`, { errors: [{ path: 'body.pointId', message: `a ${to.quantity} point` }] });
  const recordedAt = move.recordedAt ?? row.recordedAt;
  if (to.id === row.pointId && recordedAt.getTime() === row.recordedAt.getTime()) {
    throw problem('validation-failed', 'body: the recording is already filed at that point and time; nothing to move', { errors: [{ path: 'body', message: 'no change' }] });
  }

  if (row.samplesPurgedAt) {
    throw problem('conflict', `recording '${recordingId}' cannot be analysed again where it would move: its raw samples were dropped on ${row.samplesPurgedAt.toISOString().slice(0, 10)} (KINESPEC_SAMPLE_RETENTION_DAYS)`);
  }

  // analyse first, outside the transaction, as the analysis job does (its samples count against the budget)
  const modelVersion = await modelVersionAt(sql, machine.id, recordedAt);
  const model = modelVersion === null ? null : await models.get(sql, machine.id, modelVersion);
  const release = services.budget?.admit(row.sampleCount * row.channels.length) ?? (() => {});
  let analysis: RecordingAnalysis;
  try {
    const recording = await storedRecording(sql, row.id, row);
    if (!recording) throw problem('not-found', `no recording '${recordingId}' on this site`);
    analysis = await runAnalysis(pool, recording, analysisOptions(row, to, model));
  } finally {
    release();
  }
  const stored = analysisRow(row.id, modelVersion, analysis);
  await ensureTrendMonth(sql, recordedAt);

  return sql.begin(async (tx) => {
    await lockPoints(tx, [row.pointId, to.id]);
    const before = await recordingIdentity(tx, row.id);
    if (!before || before.pointId !== row.pointKey || before.machineId !== row.machineKey || before.recordedAt !== row.recordedAt.toISOString()) {
      throw problem('conflict', `recording '${recordingId}' changed while it was being moved; read it again and retry`);
    }
    try {
      await moveRecordingRow(tx, row.id, to.id, recordedAt);
    } catch (err) {
      if ((err as { code?: string }).code === '23505') {
        throw problem('conflict', `point '${pointKey}' of machine '${machineKey}' already holds a recording with the same content`);
      }
      throw err;
    }
    const inserted = await insertAnalysis(tx, stored);
    // analysed now: a job still queued for it (an upload's) finds it done and stops
    await setAnalysisState(tx, row.id, 'done');
    // the values move with the recording (writeTrendValues replaces them and rolls up the new day); the day left behind is rebuilt
    await writeTrendValues(tx, { pointId: to.id, recordingId: row.id, analysisId: inserted.id, recordedAt, indicators: analysis.indicators });
    await rebuildTrendDay(tx, row.pointId, row.recordedAt);
    const now = new Date();
    const why = `recording ${row.id} moved to ${machineKey}/${pointKey} at ${recordedAt.toISOString()}`;
    await reevaluatePointAlarms(tx, { siteId: key.siteId, point: from, at: now, why, leftRecordingId: row.id });
    if (to.id !== from.id) await reevaluatePointAlarms(tx, { siteId: key.siteId, point: to, at: now, why });
    const audit = await insertAuditEntry(tx, {
      siteId: key.siteId,
      recordingId: row.id,
      action: 'move',
      byKeyId: key.id,
      by: actorName(key),
      reason: move.reason,
      before,
      after: { machineId: machineKey, pointId: pointKey, recordedAt: recordedAt.toISOString() },
    });
    return { audit, analysis: summarise(inserted.id, analysis, row) };
  });
}
