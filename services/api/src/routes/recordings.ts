import fastifyMultipart from '@fastify/multipart';
import { detectRecordingFormat, recordingWarnings, SignalInputError, type DecodeHint } from '@kinespec/signal';
import type { FastifyRequest } from 'fastify';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import type { Services } from '../app.js';
import { ingestRecording } from '../ingest.js';
import { problem, ProblemError, type FieldError } from '../problems.js';
import {
  analysisSchema,
  hypothesisRefSchema,
  idParam,
  iso,
  isoTime,
  parseTime,
  preferredWaitMs,
  uploadResultSchema,
  zoneSchema,
} from '../schemas.js';
import {
  findMachine,
  findPoint,
  getAnalysisState,
  getCurrentAnalysis,
  getRecording,
  listAnalyses,
  listRecordings,
} from '../store.js';

/** Body types the upload route reads; anything else is 415. */
export const RECORDING_TYPES = [
  'audio/wav',
  'audio/x-wav',
  'audio/wave',
  'audio/vnd.wave',
  'text/csv',
  'application/csv',
  'text/tab-separated-values',
  'text/plain',
  'application/json',
  'application/octet-stream',
];

/** A form carries one file (the recording) and at most this many fields (the query parameters, as text). */
const MAX_FORM_FILES = 1;
const MAX_FORM_FIELDS = 20;

/** Framework codes that already name a limit the client broke (413 problems of their own). */
const FORM_LIMIT_CODES = new Set(['FST_REQ_FILE_TOO_LARGE', 'FST_PARTS_LIMIT', 'FST_FILES_LIMIT', 'FST_FIELDS_LIMIT']);

/**
 * Reads a multipart/form-data upload to its end: exactly one file part named `file`, at most
 * MAX_FORM_FIELDS text fields (in `fields`). A second file, a field too many or a body the multipart parser
 * cannot follow (no boundary, a boundary the body never uses, no closing boundary) is the client's: 400.
 */
async function readUploadForm(request: FastifyRequest, fields: Record<string, string>): Promise<{ bytes: Buffer; contentType: string | undefined; filename: string | undefined }> {
  let file: { bytes: Buffer; contentType: string | undefined; filename: string | undefined } | null = null;
  let fieldCount = 0;
  try {
    for await (const part of request.parts()) {
      if (part.type === 'file') {
        if (part.fieldname !== 'file') throw problem('bad-request', `send the recording in the form field 'file' (got '${part.fieldname}')`);
        if (file) throw problem('bad-request', 'the form holds more than one file; send one recording per request');
        file = { bytes: await part.toBuffer(), contentType: part.mimetype, filename: part.filename };
      } else {
        if (++fieldCount > MAX_FORM_FIELDS) throw problem('bad-request', `the form holds more than ${MAX_FORM_FIELDS} fields`);
        if (typeof part.value === 'string') fields[part.fieldname] = part.value;
      }
    }
  } catch (err) {
    if (err instanceof ProblemError) throw err;
    const code = (err as { code?: string }).code;
    if (code === 'FST_FILES_LIMIT') throw problem('bad-request', 'the form holds more than one file; send one recording per request');
    if (code === 'FST_FIELDS_LIMIT') throw problem('bad-request', `the form holds more than ${MAX_FORM_FIELDS} fields`);
    if (code && FORM_LIMIT_CODES.has(code)) throw err;
    throw problem('bad-request', `the multipart form cannot be read: ${(err as Error).message ?? String(err)}`);
  }
  if (!file) throw problem('bad-request', "the form has no file: send the recording in the field 'file'");
  return file;
}

const uploadQuery = z.object({
  sampleRateHz: z.coerce.number().positive().finite().optional().describe('Sample rate of raw samples (or to override a CSV/JSON file)'),
  unit: z.string().min(1).max(20).optional().describe("Unit of the samples, e.g. 'g', 'm/s^2', 'mm/s' (default: the point's unit)"),
  sampleFormat: z.enum(['float32', 'float64']).optional().describe('Raw samples: little-endian float32 (default) or float64'),
  channels: z.coerce.number().int().min(1).max(64).optional().describe('Raw samples: interleaved channel count (default 1)'),
  recordedAt: isoTime.optional().describe('When the recording was taken (default: the file metadata, else now)'),
  speedRpm: z.coerce.number().positive().finite().optional().describe('Speed of the reference shaft, when known'),
  filename: z.string().max(255).optional(),
  channel: z.string().min(1).max(100).optional().describe('The channel to analyse: a number from 1 or a channel name (default: the first vibration channel)'),
});

type UploadParams = z.infer<typeof uploadQuery>;

const HEADER_FIELDS: Array<[keyof UploadParams, string]> = [
  ['sampleRateHz', 'x-sample-rate-hz'],
  ['unit', 'x-unit'],
  ['sampleFormat', 'x-sample-format'],
  ['channels', 'x-channels'],
  ['recordedAt', 'x-recorded-at'],
  ['speedRpm', 'x-speed-rpm'],
  ['filename', 'x-filename'],
  ['channel', 'x-channel'],
];

/** Header values (X-Sample-Rate-Hz ...) fill what the query leaves out; both are checked by the same schema. */
function uploadParams(request: FastifyRequest, fields: Record<string, string>): UploadParams {
  const merged: Record<string, string> = {};
  for (const [name, header] of HEADER_FIELDS) {
    const value = request.headers[header];
    if (typeof value === 'string' && value !== '') merged[name] = value;
  }
  Object.assign(merged, fields, request.query as Record<string, string>);
  const parsed = uploadQuery.safeParse(merged);
  if (parsed.success) return parsed.data;
  const errors: FieldError[] = parsed.error.issues.map((i) => ({ path: `query.${i.path.join('.')}`, message: i.message, code: i.code }));
  throw problem('validation-failed', `${errors[0]!.path}: ${errors[0]!.message}`, { errors });
}

function idempotencyKeyOf(request: FastifyRequest): string | null {
  const value = request.headers['idempotency-key'];
  if (value === undefined || value === '') return null;
  if (typeof value !== 'string' || value.length > 200 || !/^[\x21-\x7e]+$/.test(value)) {
    throw problem('validation-failed', 'header.idempotency-key: must be 1 to 200 printable ASCII characters', {
      errors: [{ path: 'header.idempotency-key', message: 'must be 1 to 200 printable ASCII characters' }],
    });
  }
  return value;
}

const recordingMetaSchema = z.object({
  id: z.string(),
  machineId: z.string(),
  pointId: z.string(),
  recordedAt: z.string(),
  receivedAt: z.string(),
  sampleRateHz: z.number(),
  sampleCount: z.number(),
  channels: z.number(),
  channelInfo: z.array(z.object({ name: z.string(), unit: z.string() })),
  durationS: z.number(),
  contentSha256: z.string(),
  idempotencyKey: z.string().nullable(),
  sourceFormat: z.string(),
  speedRpm: z.number().nullable(),
  metadata: z.record(z.string(), z.string()),
  /** When KINESPEC_SAMPLE_RETENTION_DAYS dropped the raw samples; null while they are kept. */
  samplesPurgedAt: z.string().nullable(),
  warnings: z.array(z.string()).describe("The decoder's warnings about the file (metadata.warning, one entry each)"),
});

export const recordingRoutes: FastifyPluginAsyncZod<{ services: Services }> = async (app, { services }) => {
  const { sql } = services;
  const limit = services.config.maxUploadBytes;

  // recording bodies are read as bytes (up to the configured limit) and handed to the decoder as they are
  app.removeContentTypeParser(['application/json', 'text/plain']);
  app.addContentTypeParser(RECORDING_TYPES, { parseAs: 'buffer', bodyLimit: limit }, (_request, body, done) => done(null, body));
  // busboy's own limits are one above ours: readUploadForm counts and names the excess itself (400), where
  // busboy would stop reading silently or only at the end of the file
  await app.register(fastifyMultipart, {
    limits: { fileSize: limit, files: MAX_FORM_FILES + 1, fields: MAX_FORM_FIELDS + 1, fieldSize: 1024, parts: MAX_FORM_FIELDS + MAX_FORM_FILES + 2 },
  });

  async function pointOf(siteId: string, machineKey: string, pointKey: string) {
    const machine = await findMachine(sql, siteId, machineKey);
    if (!machine) throw problem('not-found', `no machine '${machineKey}' on this site`);
    const point = await findPoint(sql, machine.id, pointKey);
    if (!point) throw problem('not-found', `machine '${machineKey}' has no point '${pointKey}'`);
    return { machine, point };
  }

  app.post('/machines/:machineId/points/:pointId/recordings', {
    config: { permission: 'upload' },
    onResponse: async (_request, reply) => {
      if (reply.statusCode >= 500) services.metrics.uploads.inc({ outcome: 'failed' });
      else if (reply.statusCode >= 400) services.metrics.uploads.inc({ outcome: 'refused' });
    },
    bodyLimit: limit,
    schema: {
      summary: 'Upload a recording of a machine point; it is stored, analysed and trended in one go',
      description:
        'Body: audio/wav, text/csv, application/json, application/octet-stream (little-endian float32 samples; give ' +
        '`X-Sample-Rate-Hz` and `X-Unit` headers or `sampleRateHz` and `unit` query parameters) or multipart/form-data ' +
        'with the file in the field `file` (other fields as the query parameters, before the file). ' +
        'An `Idempotency-Key` header (or, without one, the content hash) makes a retry return the first result (200, duplicate: true). ' +
        'A body the decoder refuses stores nothing and answers a problem naming what is wrong.',
      tags: ['recordings'],
      params: z.object({ machineId: idParam, pointId: idParam }),
      querystring: uploadQuery,
      headers: z.looseObject({
        'idempotency-key': z.string().optional(),
        'x-sample-rate-hz': z.string().optional(),
        'x-unit': z.string().optional(),
        'x-sample-format': z.string().optional(),
        'x-recorded-at': z.string().optional(),
        'x-speed-rpm': z.string().optional(),
      }),
      rawBody: { consumes: [...RECORDING_TYPES, 'multipart/form-data'], description: 'The recording file' },
      response: { 200: uploadResultSchema, 201: uploadResultSchema, 202: uploadResultSchema },
    } as Record<string, unknown>,
  }, async (request, reply) => {
    const key = request.apiKey!;
    const params = request.params as { machineId: string; pointId: string };
    const { machine, point } = await pointOf(key.siteId, params.machineId, params.pointId);
    const idempotencyKey = idempotencyKeyOf(request);

    let bytes: Buffer;
    let contentType: string | undefined;
    let filename: string | undefined;
    const fields: Record<string, string> = {};
    if (request.isMultipart()) {
      ({ bytes, contentType, filename } = await readUploadForm(request, fields));
    } else {
      if (!Buffer.isBuffer(request.body)) {
        throw problem('unsupported-media-type', `send the recording as one of ${RECORDING_TYPES.join(', ')} or multipart/form-data`);
      }
      bytes = request.body;
      contentType = request.headers['content-type'];
    }
    const q = uploadParams(request, fields);
    const baseType = contentType?.split(';')[0]?.trim().toLowerCase();
    const raw = baseType === 'application/octet-stream' && !request.isMultipart();
    if (raw && (q.sampleRateHz === undefined)) {
      throw problem('missing-sample-rate', 'raw float samples carry no sample rate: give X-Sample-Rate-Hz (or ?sampleRateHz=) and X-Unit (or ?unit=)');
    }
    const hint: DecodeHint = {
      ...(raw ? { format: 'raw' as const, sampleFormat: q.sampleFormat ?? 'float32' } : q.sampleFormat ? { sampleFormat: q.sampleFormat } : {}),
      ...(contentType ? { contentType } : {}),
      ...(q.filename ?? filename ? { filename: q.filename ?? filename } : {}),
      ...(q.sampleRateHz !== undefined ? { sampleRateHz: q.sampleRateHz } : {}),
      ...(q.channels !== undefined ? { channels: q.channels } : {}),
      // an explicit unit overrides the file's; where neither names one, the analysis reads the point's unit and warns
      ...(q.unit ? { unit: q.unit } : {}),
    };
    let sourceFormat = 'unknown';
    try {
      sourceFormat = bytes.length > 0 ? detectRecordingFormat(bytes, hint) : 'empty';
    } catch (err) {
      if (!(err instanceof SignalInputError)) throw err;
    }
    // checked with the file's own time, whichever source wins (recorded-at.ts)
    const recordedAt = q.recordedAt !== undefined ? parseTime(q.recordedAt) : null;
    const result = await ingestRecording(services, {
      key,
      machine,
      point,
      bytes,
      hint,
      sourceFormat,
      idempotencyKey,
      recordedAt,
      speedRpm: q.speedRpm ?? null,
      channel: q.channel ?? null,
    }, preferredWaitMs(request.headers['prefer'], services.config.uploadWaitMs ?? 5_000));
    services.metrics.uploads.inc({ outcome: result.body.duplicate ? 'duplicate' : 'stored' });
    if (result.status === 201) reply.header('location', `/api/v1/recordings/${result.body.recordingId}`);
    if (result.status === 202) {
      // stored for good; its analysis is queued: poll the analysis
      reply.header('location', `/api/v1/recordings/${result.body.recordingId}/analysis`);
      reply.header('retry-after', '1');
    }
    if (result.timings) {
      const t = result.timings;
      // W3C Server Timing: where an upload's time went (analysis: the wait for the queued analysis)
      reply.header('server-timing', `decode;dur=${t.decodeMs.toFixed(1)}, store;dur=${t.storeMs.toFixed(1)}, analysis;dur=${t.analysisMs.toFixed(1)}`);
    }
    return reply.code(result.status).send(result.body);
  });

  app.get('/machines/:machineId/points/:pointId/recordings', {
    config: { permission: 'read' },
    schema: {
      summary: 'Recordings of a point, newest first, with their current analysis in brief',
      tags: ['recordings'],
      params: z.object({ machineId: idParam, pointId: idParam }),
      querystring: z.object({
        limit: z.coerce.number().int().min(1).max(1000).default(100),
        before: isoTime.optional().describe('Only recordings taken before this time (for paging)'),
      }),
      response: {
        200: z.array(z.object({
          id: z.string(),
          recordedAt: z.string(),
          sampleRateHz: z.number(),
          sampleCount: z.number(),
          channels: z.number(),
          analysisId: z.string().nullable(),
          velocityRmsMmPerS: z.number().nullable(),
          zone: zoneSchema,
          topHypothesis: hypothesisRefSchema.nullable(),
        })),
      },
    },
  }, async (request) => {
    const { point } = await pointOf(request.apiKey!.siteId, request.params.machineId, request.params.pointId);
    const rows = await listRecordings(sql, point.id, request.query.limit, request.query.before ? parseTime(request.query.before) : null);
    return rows.map((r) => ({
      ...r,
      recordedAt: iso(r.recordedAt),
      zone: r.zone,
      topHypothesis: r.topHypothesis ? { fault: r.topHypothesis.fault, component: r.topHypothesis.component, score: r.topHypothesis.score } : null,
    }));
  });

  async function recordingOf(siteId: string, recordingId: string) {
    const recording = await getRecording(sql, siteId, recordingId);
    if (!recording) throw problem('not-found', `no recording '${recordingId}' on this site`);
    return recording;
  }

  app.get('/recordings/:recordingId', {
    config: { permission: 'read' },
    schema: {
      summary: "A recording's metadata",
      tags: ['recordings'],
      params: z.object({ recordingId: z.string().max(64) }),
      response: { 200: recordingMetaSchema },
    },
  }, async (request) => {
    const r = await recordingOf(request.apiKey!.siteId, request.params.recordingId);
    return {
      id: r.id,
      machineId: r.machineKey,
      pointId: r.pointKey,
      recordedAt: iso(r.recordedAt),
      receivedAt: iso(r.receivedAt),
      sampleRateHz: r.sampleRateHz,
      sampleCount: r.sampleCount,
      channels: r.channels.length,
      channelInfo: r.channels,
      durationS: r.sampleCount / r.sampleRateHz,
      contentSha256: r.contentHash.toString('hex'),
      idempotencyKey: r.idempotencyKey,
      sourceFormat: r.sourceFormat,
      speedRpm: r.speedRpm,
      metadata: r.metadata,
      samplesPurgedAt: iso(r.samplesPurgedAt),
      warnings: recordingWarnings(r.metadata),
    };
  });

  app.get('/recordings/:recordingId/analysis', {
    config: { permission: 'read' },
    schema: {
      summary: 'The current analysis of a recording: overall levels, plot spectrum, hypotheses with evidence',
      description: '202 with Retry-After while the analysis is still queued; the problem the recording failed with when it cannot be analysed.',
      tags: ['recordings'],
      params: z.object({ recordingId: z.string().max(64) }),
      response: { 200: analysisSchema, 202: z.object({ recordingId: z.string(), analysisState: z.literal('queued') }) },
    },
  }, async (request, reply) => {
    const r = await recordingOf(request.apiKey!.siteId, request.params.recordingId);
    const state = await getAnalysisState(sql, r.id);
    if (state?.state === 'queued') {
      return reply.code(202).header('retry-after', '1').send({ recordingId: r.id, analysisState: 'queued' } as never);
    }
    if (state?.state === 'failed' && state.problem) {
      throw new ProblemError(state.problem.slug, state.problem.detail, { recordingId: r.id, ...(state.problem.code ? { code: state.problem.code } : {}) });
    }
    const a = await getCurrentAnalysis(sql, r.id);
    if (!a) throw problem('not-found', `recording '${r.id}' has no analysis`);
    return { ...a.result, id: a.id, recordingId: a.recordingId, modelVersion: a.modelVersion, createdAt: iso(a.createdAt), current: true } as z.infer<typeof analysisSchema>;
  });

  app.get('/recordings/:recordingId/analyses', {
    config: { permission: 'read' },
    schema: {
      summary: 'Every analysis a recording has had (one per re-analysis), oldest first',
      tags: ['recordings'],
      params: z.object({ recordingId: z.string().max(64) }),
      response: {
        200: z.array(z.object({
          id: z.string(),
          recordingId: z.string(),
          modelVersion: z.number().nullable(),
          softwareVersion: z.string(),
          createdAt: z.string(),
          current: z.boolean(),
        })),
      },
    },
  }, async (request) => {
    const r = await recordingOf(request.apiKey!.siteId, request.params.recordingId);
    const rows = await listAnalyses(sql, r.id);
    return rows.map((a) => ({ ...a, createdAt: iso(a.createdAt) }));
  });
};
