import { ACCEPTED_UNITS } from '@kinespec/signal';

/*
 * The service's one error registry (RFC 9457 problem details). Each problem type has a stable `type` URI,
 * a title and a status; README.md lists every one (a test holds the list and the docs in step).
 * The URIs are URNs: stable names, not links (RFC 9457 §3.1.1 allows a non-resolvable URI).
 */

export interface ProblemType {
  /** The short name, also the last part of the URI. */
  slug: string;
  status: number;
  title: string;
}

export const PROBLEM_URI_PREFIX = 'urn:kinespec:problem:';

const general = [
  { slug: 'bad-request', status: 400, title: 'The request is malformed' },
  { slug: 'validation-failed', status: 400, title: 'A request field breaks its rule' },
  { slug: 'missing-sample-rate', status: 400, title: 'Raw samples need a sample rate and unit' },
  { slug: 'unauthorized', status: 401, title: 'A valid API key is required' },
  { slug: 'forbidden', status: 403, title: "The key's role does not allow this" },
  { slug: 'not-found', status: 404, title: 'No such resource on this site' },
  { slug: 'idempotency-key-reused', status: 409, title: 'The Idempotency-Key was already used for different content' },
  { slug: 'conflict', status: 409, title: 'The change clashes with what is stored' },
  { slug: 'payload-too-large', status: 413, title: 'The request body is larger than the service accepts' },
  { slug: 'uri-too-long', status: 414, title: 'A part of the request path is longer than the service accepts' },
  { slug: 'unsupported-media-type', status: 415, title: 'The content type is not one the route accepts' },
  { slug: 'invalid-machine-model', status: 422, title: 'The machine model file has problems' },
  { slug: 'no-machine-model', status: 422, title: 'The machine has no model version to analyse against' },
  { slug: 'analysis-failed', status: 422, title: 'The recording could not be analysed' },
  { slug: 'recording-invalid', status: 422, title: 'The recording cannot be used' },
  { slug: 'recorded-in-future', status: 422, title: 'The recording is dated more than a day in the future' },
  { slug: 'time-out-of-range', status: 400, title: 'A time lies outside the range the service accepts' },
  { slug: 'rate-limited', status: 429, title: 'Too many requests; retry after the time given' },
  { slug: 'internal-error', status: 500, title: 'The service failed unexpectedly' },
  { slug: 'analysis-timed-out', status: 503, title: 'The analysis took longer than the service allows' },
  { slug: 'service-unavailable', status: 503, title: 'The service is starting, stopping or cannot reach its database' },
] as const satisfies readonly ProblemType[];

/*
 * Decoder errors (SignalInputError.code from @kinespec/signal) each get their own problem type.
 * 400: the bytes do not follow the format they claim; 422: well formed but not a usable recording;
 * 413: beyond the decoder's size limits.
 */
export const recordingProblemByCode = {
  empty_input: { status: 400, title: 'The recording is empty' },
  no_samples: { status: 422, title: 'The recording holds no complete sample' },
  too_large: { status: 413, title: 'The recording has more channels or samples than accepted' },
  unsupported_format: { status: 422, title: 'The recording format or sample encoding is not supported' },
  option_invalid: { status: 400, title: 'A decoding option is missing or out of range' },
  sensitivity_invalid: { status: 422, title: 'The sensor sensitivity is incomplete or out of range' },
  sample_rate_invalid: { status: 422, title: 'The sample rate is missing or not a positive finite number' },
  non_finite_sample: { status: 422, title: 'A sample is NaN or infinite' },
  channel_length_mismatch: { status: 422, title: 'The channels have different lengths' },
  wav_not_riff: { status: 400, title: 'The body is not a RIFF/WAVE file' },
  wav_truncated: { status: 400, title: 'The WAV file is cut short' },
  wav_format_invalid: { status: 422, title: 'The WAV format chunk is inconsistent' },
  wav_missing_chunk: { status: 400, title: "The WAV file lacks its 'fmt ' or 'data' chunk" },
  csv_column_count: { status: 400, title: 'A CSV line has the wrong number of cells' },
  csv_non_numeric: { status: 400, title: 'A CSV cell that should hold a number does not' },
  csv_time_invalid: { status: 422, title: 'The CSV time column cannot give a sample rate' },
  csv_uneven_time: { status: 422, title: 'The CSV time column is not evenly spaced' },
  json_syntax: { status: 400, title: 'The body is not valid JSON' },
  json_schema: { status: 422, title: 'The JSON document does not have the recording shape' },
  raw_size_mismatch: { status: 400, title: 'The raw byte count is not a whole number of samples' },
  unknown_unit: { status: 400, title: 'The unit is not one Kinespec knows' },
} as const satisfies Record<string, { status: number; title: string }>;

export type RecordingProblemCode = keyof typeof recordingProblemByCode;

/** The problem slug of a decoder code: "wav_truncated" → "recording-wav-truncated". */
export function recordingProblemSlug(code: string): string {
  return `recording-${code.replace(/_/g, '-')}`;
}

export const problemTypes: readonly ProblemType[] = [
  ...general,
  ...Object.entries(recordingProblemByCode).map(([code, p]) => ({ slug: recordingProblemSlug(code), status: p.status, title: p.title })),
];

export type ProblemSlug = (typeof general)[number]['slug'];

const bySlug = new Map(problemTypes.map((p) => [p.slug, p]));

export function problemUri(slug: string): string {
  return `${PROBLEM_URI_PREFIX}${slug}`;
}

export interface FieldError {
  path: string;
  message: string;
  code?: string;
}

/** The body of an application/problem+json response. */
export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  errors?: FieldError[];
  [extension: string]: unknown;
}

/** Thrown anywhere in a request; the error handler turns it into problem+json. */
export class ProblemError extends Error {
  override readonly name = 'ProblemError';
  readonly problem: ProblemType;
  constructor(
    slug: string,
    readonly detail: string,
    readonly extras: { errors?: FieldError[]; headers?: Record<string, string>; [key: string]: unknown } = {},
  ) {
    super(detail);
    const problem = bySlug.get(slug);
    if (!problem) throw new Error(`unregistered problem type ${slug}`);
    this.problem = problem;
  }

  get status(): number {
    return this.problem.status;
  }

  body(instance?: string): ProblemBody {
    const { headers: _headers, ...extensions } = this.extras;
    return {
      type: problemUri(this.problem.slug),
      title: this.problem.title,
      status: this.problem.status,
      detail: this.detail,
      ...(instance ? { instance } : {}),
      ...extensions,
    };
  }
}

export function problem(slug: ProblemSlug, detail: string, extras?: ProblemError['extras']): ProblemError {
  return new ProblemError(slug, detail, extras);
}

/** A decoder's SignalInputError as a problem; an unknown code falls back to recording-invalid. */
export function recordingProblem(code: string, message: string, where?: string): ProblemError {
  const slug = code in recordingProblemByCode ? recordingProblemSlug(code) : 'recording-invalid';
  const detail = where ? `${message} (at ${where})` : message;
  // an unknown unit answers with the list to choose from, as data as well as in the detail
  const accepted = code === 'unknown_unit' ? { acceptedUnits: [...ACCEPTED_UNITS] } : {};
  return new ProblemError(slug, detail, { code, ...(where ? { where } : {}), ...accepted });
}
