import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { basename, extname } from 'node:path';
import { parseArgs } from 'node:util';
import { CliError } from '../cli-error.js';
import { renamedFlagHint } from '../flags.js';
import { unitFlag } from '../recording-file.js';
import type { CliIo } from '../io.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec upload <files...> --server URL --key KEY --machine ID --point ID\n' +
  '       [--recorded-at ISO-TIME] [--speed-rpm N] [--sample-rate-hz F] [--unit UNIT] [--retries 5] [--backoff-ms 500] [--json]\n\n' +
  'Uploads field recordings (.wav, .csv, .tsv, .txt, .json; raw little-endian float32 .f32/.raw/.bin with\n' +
  '--sample-rate-hz and --unit) to a Kinespec server. Each upload carries an Idempotency-Key derived from the\n' +
  "file's SHA-256 (and the machine and point), so running the command again never stores a file twice.\n" +
  'Network errors, 429 and 5xx answers are retried with exponential backoff (Retry-After is honoured).';

const CONTENT_TYPES: Record<string, string> = {
  '.wav': 'audio/wav',
  '.wave': 'audio/wav',
  '.csv': 'text/csv',
  '.tsv': 'text/tab-separated-values',
  '.txt': 'text/csv',
  '.json': 'application/json',
  '.f32': 'application/octet-stream',
  '.raw': 'application/octet-stream',
  '.bin': 'application/octet-stream',
};

interface UploadFlags {
  server: string;
  key: string;
  machine: string;
  point: string;
  recordedAt?: string;
  speedRpm?: number;
  sampleRateHz?: number;
  unit?: string;
  retries: number;
  backoffMs: number;
  json: boolean;
}

function positive(flag: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const x = Number(text);
  if (!Number.isFinite(x) || x <= 0) throw new CliError(`${flag} (${text}) must be a number > 0`);
  return x;
}

function wholeAtLeast(flag: string, text: string | undefined, min: number, fallback: number): number {
  if (text === undefined) return fallback;
  const x = Number(text);
  if (!Number.isInteger(x) || x < min) throw new CliError(`${flag} (${text}) must be a whole number >= ${min}`);
  return x;
}

function parseFlags(args: string[]): { files: string[]; flags: UploadFlags } {
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      strict: true,
      options: {
        server: { type: 'string' },
        key: { type: 'string' },
        machine: { type: 'string' },
        point: { type: 'string' },
        'recorded-at': { type: 'string' },
        'speed-rpm': { type: 'string' },
        'sample-rate-hz': { type: 'string' },
        unit: { type: 'string' },
        retries: { type: 'string' },
        'backoff-ms': { type: 'string' },
        json: { type: 'boolean', default: false },
      },
    });
  } catch (err) {
    throw new CliError(renamedFlagHint(args) ?? (err instanceof Error ? err.message : String(err)));
  }
  const v = parsed.values;
  for (const flag of ['server', 'key', 'machine', 'point'] as const) {
    if (!v[flag]) throw new CliError(`--${flag} is required (usage: kinespec upload --help)`);
  }
  if (parsed.positionals.length === 0) throw new CliError('give at least one file to upload');
  let server: URL;
  try {
    server = new URL(v.server!);
  } catch {
    throw new CliError(`--server (${v.server}) must be a URL such as http://127.0.0.1:8080`);
  }
  if (server.protocol !== 'http:' && server.protocol !== 'https:') throw new CliError(`--server (${v.server}) must be an http or https URL`);
  if (v['recorded-at'] !== undefined && Number.isNaN(Date.parse(v['recorded-at']))) {
    throw new CliError(`--recorded-at (${v['recorded-at']}) must be an ISO 8601 time, e.g. 2025-03-14T08:00:00Z`);
  }
  return {
    files: parsed.positionals,
    flags: {
      server: server.toString().replace(/\/+$/, ''),
      key: v.key!,
      machine: v.machine!,
      point: v.point!,
      ...(v['recorded-at'] !== undefined ? { recordedAt: v['recorded-at'] } : {}),
      ...(v['speed-rpm'] !== undefined ? { speedRpm: positive('--speed-rpm', v['speed-rpm'])! } : {}),
      ...(v['sample-rate-hz'] !== undefined ? { sampleRateHz: positive('--sample-rate-hz', v['sample-rate-hz'])! } : {}),
      ...(v.unit !== undefined ? { unit: unitFlag(v.unit)! } : {}),
      retries: wholeAtLeast('--retries', v.retries, 0, 5),
      backoffMs: wholeAtLeast('--backoff-ms', v['backoff-ms'], 0, 500),
      json: v.json ?? false,
    },
  };
}

/** The Idempotency-Key of a file: SHA-256 over the machine, the point and the file's bytes. */
export function uploadIdempotencyKey(machine: string, point: string, bytes: Uint8Array): string {
  return `sha256:${createHash('sha256').update(machine).update('\0').update(point).update('\0').update(bytes).digest('hex')}`;
}

/** Whether an answer or failure is worth another try: network errors, 408, 429 and 5xx. */
export function retryable(status: number | null): boolean {
  return status === null || status === 408 || status === 429 || status >= 500;
}

/** Delay before retry `attempt` (0-based): Retry-After when the server gives one, else backoff x 2^attempt, with jitter. */
export function retryDelayMs(attempt: number, backoffMs: number, retryAfter: string | null): number {
  if (retryAfter !== null) {
    const seconds = Number(retryAfter);
    if (Number.isFinite(seconds) && seconds >= 0) return Math.min(seconds * 1000, 120_000);
    const at = Date.parse(retryAfter);
    if (!Number.isNaN(at)) return Math.min(Math.max(0, at - Date.now()), 120_000);
  }
  return backoffMs * 2 ** attempt * (0.75 + 0.5 * Math.random());
}

interface UploadOutcome {
  file: string;
  ok: boolean;
  status: number | null;
  body: Record<string, unknown> | null;
  error?: string;
  attempts: number;
}

async function uploadOne(file: string, flags: UploadFlags, io: CliIo): Promise<UploadOutcome> {
  let bytes: Buffer;
  try {
    if (!statSync(file).isFile()) throw new Error('not a file');
    bytes = readFileSync(file);
  } catch (err) {
    return { file, ok: false, status: null, body: null, error: `cannot read ${file}: ${(err as Error).message}`, attempts: 0 };
  }
  const contentType = CONTENT_TYPES[extname(file).toLowerCase()];
  if (!contentType) {
    return { file, ok: false, status: null, body: null, error: `${file}: unknown file type '${extname(file)}' (use .wav, .csv, .tsv, .txt, .json, .f32, .raw or .bin)`, attempts: 0 };
  }
  const query = new URLSearchParams({ filename: basename(file) });
  if (flags.recordedAt) query.set('recordedAt', flags.recordedAt);
  if (flags.speedRpm !== undefined) query.set('speedRpm', String(flags.speedRpm));
  if (flags.sampleRateHz !== undefined) query.set('sampleRateHz', String(flags.sampleRateHz));
  if (flags.unit) query.set('unit', flags.unit);
  const url = `${flags.server}/api/v1/machines/${encodeURIComponent(flags.machine)}/points/${encodeURIComponent(flags.point)}/recordings?${query}`;
  const headers = {
    authorization: `Bearer ${flags.key}`,
    'content-type': contentType,
    'idempotency-key': uploadIdempotencyKey(flags.machine, flags.point, bytes),
  };
  for (let attempt = 0; ; attempt++) {
    let status: number | null = null;
    let retryAfter: string | null = null;
    let body: Record<string, unknown> | null = null;
    let error: string | undefined;
    try {
      const response = await fetch(url, { method: 'POST', headers, body: bytes });
      status = response.status;
      retryAfter = response.headers.get('retry-after');
      const text = await response.text();
      try {
        body = JSON.parse(text) as Record<string, unknown>;
      } catch {
        body = null;
      }
      if (response.ok) return { file, ok: true, status, body, attempts: attempt + 1 };
      error = body && typeof body['detail'] === 'string' ? `${body['title'] ?? ''}: ${body['detail']}` : `HTTP ${status}`;
    } catch (err) {
      const cause = (err as { cause?: { code?: string; message?: string } }).cause;
      error = `cannot reach ${flags.server}: ${cause?.code ?? cause?.message ?? (err as Error).message}`;
    }
    if (!retryable(status) || attempt >= flags.retries) {
      return { file, ok: false, status, body, error: `${file}: ${error}`, attempts: attempt + 1 };
    }
    const delay = retryDelayMs(attempt, flags.backoffMs, retryAfter);
    io.err(`kinespec upload: ${file}: ${error}; retrying in ${(delay / 1000).toFixed(1)} s (${attempt + 1}/${flags.retries})`);
    await new Promise((resolve) => setTimeout(resolve, delay));
  }
}

function describeOutcome(o: UploadOutcome): string {
  const b = o.body as {
    recordingId?: string;
    duplicate?: boolean;
    analysisState?: string;
    analysis?: { velocityRmsMmPerS?: number | null; zone?: string | null; topHypotheses?: Array<{ fault: string; component: string; score: number }>; warnings?: string[] };
  };
  const a = b.analysis;
  const parts = [`${o.file}: recording ${b.recordingId}${b.duplicate ? ' (already stored)' : ''}`];
  if (a?.velocityRmsMmPerS != null) parts.push(`${a.velocityRmsMmPerS.toFixed(2)} mm/s r.m.s.${a.zone ? `, zone ${a.zone}` : ''}`);
  const top = a?.topHypotheses?.[0];
  if (top) parts.push(`top hypothesis ${top.fault} on ${top.component} (${top.score.toFixed(2)})`);
  // 202: stored for good, analysed later by a worker of the queue
  if (b.analysisState === 'queued') parts.push(`analysis queued: GET /api/v1/recordings/${b.recordingId}/analysis`);
  // what the server assumed or set aside (unit read as the point's, nominal speed, mistyped keys): one note each
  return [parts.join('; '), ...(a?.warnings ?? []).map((w) => `  note: ${w}`)].join('\n');
}

export const uploadVerb: Verb = {
  name: 'upload',
  summary: 'upload recordings to a Kinespec server, with retries and idempotency keys',
  usage: USAGE,
  async run(args, io) {
    const { files, flags } = parseFlags(args);
    const outcomes: UploadOutcome[] = [];
    for (const file of files) {
      const outcome = await uploadOne(file, flags, io);
      outcomes.push(outcome);
      if (!flags.json) {
        if (outcome.ok) io.out(describeOutcome(outcome));
        else io.err(`kinespec upload: ${outcome.error}`);
      }
    }
    if (flags.json) io.out(JSON.stringify(outcomes.map(({ file, ok, status, body, error, attempts }) => ({ file, ok, status, body, error, attempts })), null, 2));
    const failed = outcomes.filter((o) => !o.ok).length;
    if (failed > 0 && !flags.json) io.err(`kinespec upload: ${failed} of ${outcomes.length} file(s) not uploaded`);
    return failed > 0 ? 2 : 0;
  },
};
