import { createHash } from 'node:crypto';
import { decodeRecording, recordingWarnings, SignalInputError, type DecodeHint, type Recording } from '@kinespec/signal';
import type { AnalysisPool } from './analysis-pool.js';
import type { analyse, RecordingAnalysis } from './analysis.js';
import type { AnalysisQueue } from './analysis-queue.js';
import type { Queryable, Sql } from './database.js';
import { problem, ProblemError, recordingProblem } from './problems.js';
import { recordedAtOf } from './recorded-at.js';
import type { SampleBudget } from './sample-budget.js';
import { packSamples, roundToFloat32 } from './samples-codec.js';
import {
  findDuplicateRecording,
  getAnalysisState,
  getCurrentAnalysis,
  insertRecording,
  type ApiKeyRow,
  type MachineRow,
  type PointRow,
} from './store.js';

/*
 * Ingest: bytes in, one stored recording and its queued analysis out (ingestRecording below); the analysis,
 * trend values and alarms are stored by the job (analysis-job.ts).
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
  /** The channel to analyse: a 1-based number or a channel name; null lets the analysis choose. */
  channel?: string | null;
}


export interface AnalysisSummary {
  analysisId: string;
  velocityRmsMmPerS: number | null;
  zone: 'A' | 'B' | 'C' | 'D' | null;
  speedHz: number | null;
  speedSource: string | null;
  topHypotheses: Array<{ fault: string; component: string; score: number; reason: string }>;
  /** the decoder's warnings about the file, then the analysis's: everything assumed or set aside */
  warnings: string[];
  /** the channel analysed, numbered from 1, and every channel of the recording */
  analysedChannel: number | null;
  channels: Array<{ name: string; unit: string }>;
}

export interface UploadResult {
  /** 201 stored and analysed, 200 a retry of a stored recording, 202 stored with its analysis still queued. */
  status: 200 | 201 | 202;
  body: { recordingId: string; duplicate: boolean; analysisState: 'queued' | 'done'; analysis: AnalysisSummary | null };
  /** Milliseconds spent decoding, storing and waiting for the analysis: a Server-Timing header. */
  timings?: { decodeMs: number; analysisMs: number; storeMs: number };
}

/** What an answer shows of the stored recording beside its analysis: the file's warnings and its channels. */
export type RecordingFacts = { metadata: Readonly<Record<string, string>>; channels: ReadonlyArray<{ name: string; unit: string }> };

export function summarise(analysisId: string, a: RecordingAnalysis, recording: RecordingFacts): AnalysisSummary {
  return {
    analysisId,
    velocityRmsMmPerS: finiteOrNull(a.overall?.velocityRmsMmPerS),
    zone: a.overall?.zone ?? null,
    speedHz: finiteOrNull(a.speedHz),
    speedSource: a.speedSource ?? null,
    // hypotheses come highest score first, so those >= 0.5 lead
    topHypotheses: (a.hypotheses ?? []).slice(0, 5).map((h) => ({ fault: h.fault, component: h.component, score: h.score, reason: h.reason })),
    warnings: [...recordingWarnings(recording.metadata), ...(a.warnings ?? [])],
    analysedChannel: typeof a.channel === 'number' ? a.channel + 1 : null,
    channels: recording.channels.map((c) => ({ name: c.name, unit: c.unit })),
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

/** What an upload needs of the service. */
export interface IngestServices {
  sql: Sql;
  queue: AnalysisQueue;
  budget?: SampleBudget;
}

/** The 1-based number of the channel a request names by number or name; the problem lists the channels. */
export function channelNumber(recording: Pick<Recording, 'channels'>, selector: string): number {
  const byName = recording.channels.findIndex((c) => c.name === selector);
  if (byName >= 0) return byName + 1;
  const n = Number(selector);
  if (Number.isInteger(n) && n >= 1 && n <= recording.channels.length) return n;
  const list = recording.channels.map((c, i) => `${i + 1} '${c.name}'`).join(', ');
  throw problem('validation-failed', `query.channel: '${selector}' names no channel; the recording has ${list}`, {
    errors: [{ path: 'query.channel', message: `names no channel; the recording has ${list}` }],
  });
}

/**
 * The answer an upload gives once its recording is stored: 201 (or 200 for a retry) with the analysis when it
 * was stored within `waitMs`, the analysis problem (422, with the recording id) when the recording cannot be
 * analysed, else 202: the recording is safe and its analysis follows (poll its Location).
 */
async function answerFor(
  services: IngestServices,
  stored: { id: string; facts: RecordingFacts },
  duplicate: boolean,
  waitMs: number,
  timings?: UploadResult['timings'],
): Promise<UploadResult> {
  const recordingId = stored.id;
  const t0 = performance.now();
  const state = await services.queue.waitFor(recordingId, waitMs);
  const waited = performance.now() - t0;
  const withWait = timings ? { ...timings, analysisMs: waited } : undefined;
  if (state === 'failed') {
    const row = await getAnalysisState(services.sql, recordingId);
    const p = row?.problem ?? { slug: 'analysis-failed', detail: 'the recording could not be analysed' };
    throw new ProblemError(p.slug, p.detail, { recordingId, ...(p.code ? { code: p.code } : {}) });
  }
  const current = state === 'done' ? await getCurrentAnalysis(services.sql, recordingId) : null;
  return {
    status: state === 'queued' ? 202 : duplicate ? 200 : 201,
    body: {
      recordingId,
      duplicate,
      analysisState: state === 'queued' ? 'queued' : 'done',
      analysis: current ? summarise(current.id, current.result as unknown as RecordingAnalysis, stored.facts) : null,
    },
    ...(withWait ? { timings: withWait } : {}),
  };
}

async function duplicateOf(sql: Queryable, input: UploadInput, contentHash: Buffer): Promise<{ id: string; facts: RecordingFacts } | null> {
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
  return { id: earlier.id, facts: earlier };
}

/**
 * Ingest: bytes in, one stored recording and its queued analysis out. Decoding comes first, so a bad body
 * stores nothing; then one transaction stores the recording (with the channel the request named) and sends its
 * analysis job (analysis-queue.ts). From the commit on the recording is durable: the answer then waits up to
 * `waitMs` for the analysis.
 */
export async function ingestRecording(services: IngestServices, input: UploadInput, waitMs: number): Promise<UploadResult> {
  const { sql } = services;
  const contentHash = createHash('sha256').update(input.bytes).digest();
  const earlier = await duplicateOf(sql, input, contentHash);
  if (earlier) return answerFor(services, earlier, true, waitMs);

  const t0 = performance.now();
  const decoded = decodeBody(input.bytes, input.hint);
  const release = services.budget?.admit(decoded.channels.reduce((n, c) => n + c.samples.length, 0)) ?? (() => {});
  let recordingId: string;
  let recording: Recording;
  let t1: number;
  let t2: number;
  try {
    const sampleCount = decoded.channels[0]?.samples.length ?? 0;
    const samples = packSamples(decoded.channels.map((c) => c.samples));
    // analyse exactly what is stored (float32), so a re-analysis of the same version repeats the result:
    // rounded in place (the decoder's arrays are ours), not unpacked into a second copy of the recording
    recording = {
      sampleRateHz: decoded.sampleRateHz,
      metadata: decoded.metadata,
      channels: decoded.channels.map((c) => ({
        name: c.name,
        // a channel whose file states no unit stays 'unknown': the analysis reads it in the point's unit and says so
        unit: c.unit,
        samples: roundToFloat32(c.samples),
      })),
    };
    const channel = input.channel ? channelNumber(recording, input.channel) : null;
    const recordedAt = recordedAtOf(input.recordedAt, recording);
    const toStore = recording;
    t1 = performance.now();
    try {
      recordingId = await sql.begin(async (tx) => {
        const id = await insertRecording(tx, {
          siteId: input.key.siteId,
          pointId: input.point.id,
          recordedAt,
          sampleRateHz: toStore.sampleRateHz,
          sampleCount,
          channels: toStore.channels.map((c) => ({ name: c.name, unit: c.unit })),
          samples,
          contentHash,
          idempotencyKey: input.idempotencyKey,
          sourceFormat: input.sourceFormat,
          speedRpm: input.speedRpm,
          metadata: toStore.metadata,
          uploadedBy: input.key.id,
          analysisState: 'queued',
          analysisChannel: channel,
        });
        await services.queue.enqueueIn(tx, id);
        return id;
      });
    } catch (err) {
      // a concurrent retry won the race to the unique index: answer as the retry it is
      if (isUniqueViolation(err)) {
        const again = await duplicateOf(sql, input, contentHash);
        if (again) return answerFor(services, again, true, waitMs);
      }
      throw err;
    }
    t2 = performance.now();
    services.queue.offerLocal(recordingId, recording);
  } finally {
    release();
  }
  return answerFor(services, { id: recordingId, facts: recording }, false, waitMs, { decodeMs: t1 - t0, storeMs: t2 - t1, analysisMs: 0 });
}
