import { createHash } from 'node:crypto';
import { decodeRecording, SignalInputError, type DecodeHint, type Recording } from '@kinespec/signal';
import type { AnalysisPool } from './analysis-pool.js';
import { softwareVersion, type analyse, type RecordingAnalysis } from './analysis.js';
import { evaluateAlarms } from './alarms.js';
import type { Sql } from './database.js';
import type { ModelCache } from './model-cache.js';
import { problem, ProblemError, recordingProblem } from './problems.js';
import { recordedAtOf } from './recorded-at.js';
import type { SampleBudget } from './sample-budget.js';
import { packSamples, roundToFloat32 } from './samples-codec.js';
import {
  findDuplicateRecording,
  getCurrentAnalysis,
  insertAnalysis,
  insertRecording,
  lockPoint,
  modelVersionAt,
  writeTrendValues,
  type ApiKeyRow,
  type MachineRow,
  type PointRow,
} from './store.js';

/*
 * Ingest: bytes in, one stored recording with its analysis, trend values and alarms out, in one
 * transaction. Decoding and analysis run before the transaction opens, so a bad body stores nothing
 * and a slow analysis holds no lock.
 */

export interface UploadInput {
  key: ApiKeyRow;
  machine: MachineRow;
  point: PointRow;
  bytes: Buffer;
  /** What the decoder knows: content type, file name, sample rate, unit, raw sample format. */
  hint: DecodeHint;
  sourceFormat: string;
  idempotencyKey: string | null;
  recordedAt: Date | null;
  speedRpm: number | null;
  /** Unit for channels whose file names none (raw floats, float WAV): the point's unit. */
  defaultUnit: string | null;
}

/** Units a decoder reports when the file does not say. */
const UNSTATED_UNITS = new Set(['', 'unknown']);

export interface AnalysisSummary {
  analysisId: string;
  velocityRmsMmPerS: number | null;
  zone: 'A' | 'B' | 'C' | 'D' | null;
  speedHz: number | null;
  speedSource: string | null;
  topHypotheses: Array<{ fault: string; component: string; score: number; reason: string }>;
}

export interface UploadResult {
  status: 200 | 201;
  body: { recordingId: string; duplicate: boolean; analysis: AnalysisSummary | null };
  /** Milliseconds spent decoding, analysing (including the wait for a thread) and storing: a Server-Timing header. */
  timings?: { decodeMs: number; analysisMs: number; storeMs: number };
}

export function summarise(analysisId: string, a: RecordingAnalysis): AnalysisSummary {
  return {
    analysisId,
    velocityRmsMmPerS: finiteOrNull(a.overall?.velocityRmsMmPerS),
    zone: a.overall?.zone ?? null,
    speedHz: finiteOrNull(a.speedHz),
    speedSource: a.speedSource ?? null,
    // hypotheses come highest score first, so those >= 0.5 lead
    topHypotheses: (a.hypotheses ?? []).slice(0, 5).map((h) => ({ fault: h.fault, component: h.component, score: h.score, reason: h.reason })),
  };
}

function finiteOrNull(x: number | null | undefined): number | null {
  return typeof x === 'number' && Number.isFinite(x) ? x : null;
}

/** Decodes the body; decoder errors become their problem types. */
export function decodeBody(bytes: Buffer, hint: DecodeHint): Recording {
  try {
    return decodeRecording(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), hint);
  } catch (err) {
    if (err instanceof SignalInputError) throw recordingProblem(err.code, err.message, err.where);
    throw err;
  }
}

/** Analysis errors of the packages (bad unit, too short a record) are the client's: 422, nothing stored. */
export async function runAnalysis(pool: AnalysisPool, recording: Recording, options: Parameters<typeof analyse>[1]): Promise<RecordingAnalysis> {
  try {
    return await pool.run(recording, options);
  } catch (err) {
    const e = err as { name?: string; code?: unknown; message?: string };
    if (err instanceof Error && typeof e.code === 'string' && /InputError$/.test(e.name ?? '')) {
      throw new ProblemError('analysis-failed', e.message ?? 'the recording could not be analysed', { code: e.code });
    }
    throw err;
  }
}

/** Significant digits kept of the plot spectra and evidence in a stored analysis. */
export const STORED_SIGNIFICANT_DIGITS = 6;

/**
 * The analysis as stored, as JSON text made in one pass: non-finite numbers (the NaN kurtosis of a constant
 * record) become null, and plot spectra and evidence are rounded to six significant digits (far finer than a
 * plot or a reading needs, and a third fewer bytes); `overall` and `indicators` keep full precision, the same
 * values the trends hold.
 */
export function storedAnalysisJson(a: RecordingAnalysis): string {
  return JSON.stringify(a, function (this: unknown, _key: string, v: unknown) {
    if (typeof v !== 'number') return v;
    if (!Number.isFinite(v)) return null;
    // `this` is the object holding the value: overall and indicators are the top level's own children
    if (this === a.overall || this === a.indicators || Number.isInteger(v)) return v;
    return Number(v.toPrecision(STORED_SIGNIFICANT_DIGITS));
  });
}

/** A number for a column, null when the analysis gave none or a non-finite one. */
export function finite(x: number | null | undefined): number | null {
  return typeof x === 'number' && Number.isFinite(x) ? x : null;
}

function isUniqueViolation(err: unknown): boolean {
  return typeof err === 'object' && err !== null && (err as { code?: string }).code === '23505';
}

async function duplicateResult(sql: Sql, input: UploadInput, contentHash: Buffer): Promise<UploadResult | null> {
  const earlier = await findDuplicateRecording(sql, {
    siteId: input.key.siteId,
    pointId: input.point.id,
    idempotencyKey: input.idempotencyKey,
    contentHash,
  });
  if (!earlier) return null;
  if (!earlier.contentHash.equals(contentHash) || earlier.pointId !== input.point.id) {
    throw problem(
      'idempotency-key-reused',
      `Idempotency-Key '${input.idempotencyKey}' was first used for recording ${earlier.id} with other content or another point; use a new key for new content`,
    );
  }
  const current = await getCurrentAnalysis(sql, earlier.id);
  return {
    status: 200,
    body: {
      recordingId: earlier.id,
      duplicate: true,
      analysis: current ? summarise(current.id, current.result as unknown as RecordingAnalysis) : null,
    },
  };
}

export async function ingestRecording(
  services: { sql: Sql; models: ModelCache; analysis: AnalysisPool; budget?: SampleBudget },
  input: UploadInput,
): Promise<UploadResult> {
  const { sql } = services;
  const contentHash = createHash('sha256').update(input.bytes).digest();
  const retry = await duplicateResult(sql, input, contentHash);
  if (retry) return retry;

  const t0 = performance.now();
  const decoded = decodeBody(input.bytes, input.hint);
  const release = services.budget?.admit(decoded.channels.reduce((n, c) => n + c.samples.length, 0)) ?? (() => {});
  try {
    return await analyseAndStore(services, input, decoded, contentHash, t0);
  } finally {
    release();
  }
}

async function analyseAndStore(
  { sql, models, analysis: pool }: { sql: Sql; models: ModelCache; analysis: AnalysisPool },
  input: UploadInput,
  decoded: Recording,
  contentHash: Buffer,
  t0: number,
): Promise<UploadResult> {
  const sampleCount = decoded.channels[0]?.samples.length ?? 0;
  const samples = packSamples(decoded.channels.map((c) => c.samples));
  // analyse exactly what is stored (float32), so a re-analysis of the same version repeats the result:
  // rounded in place (the decoder's arrays are ours), not unpacked into a second copy of the recording
  const stored = decoded.channels.map((c) => roundToFloat32(c.samples));
  const recording: Recording = {
    sampleRateHz: decoded.sampleRateHz,
    metadata: decoded.metadata,
    channels: decoded.channels.map((c, i) => ({
      name: c.name,
      unit: UNSTATED_UNITS.has(c.unit) && input.defaultUnit ? input.defaultUnit : c.unit,
      samples: stored[i]!,
    })),
  };
  const recordedAt = recordedAtOf(input.recordedAt, recording);
  const modelVersion = await modelVersionAt(sql, input.machine.id, recordedAt);
  const model = modelVersion === null ? null : await models.get(sql, input.machine.id, modelVersion);
  const t1 = performance.now();
  const analysis = await runAnalysis(pool, recording, {
    model,
    pointId: input.point.pointKey,
    pointUnit: input.point.unit,
    ...(input.speedRpm !== null ? { speedRpm: input.speedRpm } : {}),
  });
  const resultJson = storedAnalysisJson(analysis);
  const t2 = performance.now();
  const top = analysis.hypotheses[0];

  try {
    return await sql.begin(async (tx) => {
      const recordingId = await insertRecording(tx, {
        siteId: input.key.siteId,
        pointId: input.point.id,
        recordedAt,
        sampleRateHz: recording.sampleRateHz,
        sampleCount,
        channels: recording.channels.map((c) => ({ name: c.name, unit: c.unit })),
        samples,
        contentHash,
        idempotencyKey: input.idempotencyKey,
        sourceFormat: input.sourceFormat,
        speedRpm: input.speedRpm,
        metadata: recording.metadata,
        uploadedBy: input.key.id,
      });
      const stored = await insertAnalysis(tx, {
        recordingId,
        modelVersion,
        softwareVersion: analysis.softwareVersion ?? softwareVersion(),
        speedHz: finite(analysis.speedHz),
        speedSource: analysis.speedSource,
        velocityRmsMmPerS: finite(analysis.overall.velocityRmsMmPerS),
        zone: analysis.overall.zone,
        topHypothesis: top ? { fault: top.fault, component: top.component, score: top.score, reason: top.reason } : null,
        resultJson,
      });
      // only the point's roll-up and alarms need one writer at a time; the large rows above do not
      await lockPoint(tx, input.point.id);
      await writeTrendValues(tx, {
        pointId: input.point.id,
        recordingId,
        analysisId: stored.id,
        recordedAt,
        indicators: analysis.indicators,
      });
      await evaluateAlarms(tx, {
        siteId: input.key.siteId,
        point: input.point,
        recordingId,
        recordedAt,
        indicators: analysis.indicators,
      });
      return {
        status: 201 as const,
        body: { recordingId, duplicate: false, analysis: summarise(stored.id, analysis) },
        timings: { decodeMs: t1 - t0, analysisMs: t2 - t1, storeMs: performance.now() - t2 },
      };
    });
  } catch (err) {
    // a concurrent retry won the race to the unique index: answer as the retry it is
    if (isUniqueViolation(err)) {
      const again = await duplicateResult(sql, input, contentHash);
      if (again) return again;
    }
    throw err;
  }
}
