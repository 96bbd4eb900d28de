import type { Channel, Recording } from '../recording.js';
import { decodeError } from './decode-error.js';
import { checkRecordingSize, resolveDecodeLimits, type DecodeLimits } from './decode-limits.js';
import { canonicalChannelUnit, checkChannelUnit, UNSTATED_UNIT } from '../units/channel-units.js';
import { addWarning, channelNames, checkSampleRate, optionUnit } from './recording-parts.js';
import { inputText } from './text-input.js';

export interface JsonDecodeOptions {
  /** Overrides the document's `sampleRateHz` (a warning in metadata notes a disagreement). */
  sampleRateHz?: number;
  /** Overrides every channel's unit (a warning in metadata notes a disagreement). */
  unit?: string;
  channelNames?: readonly string[];
  limits?: Partial<DecodeLimits>;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function schemaError(message: string, path: string): never {
  throw decodeError('json_schema', `${path}: ${message}`, path);
}

/** JSON text of a value for messages and metadata; objects handed in directly may hold BigInts or cycles. */
function describe(value: unknown): string {
  try {
    return JSON.stringify(value) ?? String(value);
  } catch {
    return String(value);
  }
}

function metadataValue(value: unknown): string {
  return typeof value === 'string' ? value : describe(value);
}

/**
 * Decodes `{ "sampleRateHz": 25600, "unit": "g", "channels": [{ "name": "DE-H", "samples": [...], "unit"?: "g" }] }`.
 * Other top-level fields become metadata (strings as they are, anything else as JSON); the entries of a
 * top-level `metadata` object are merged in. Every channel must have the same number of finite samples.
 */
export function decodeJsonRecording(input: string | Uint8Array | object, options: JsonDecodeOptions = {}): Recording {
  const limits = resolveDecodeLimits(options.limits);
  const unitOption = optionUnit(options.unit);
  let document: unknown = input;
  if (typeof input === 'string' || input instanceof Uint8Array) {
    const text = inputText(input);
    if (text.trim() === '') throw decodeError('empty_input', 'The JSON recording is empty.');
    try {
      document = JSON.parse(text);
    } catch (error) {
      throw decodeError('json_syntax', `The recording is not valid JSON: ${(error as Error).message}.`);
    }
  }
  if (!isRecord(document)) schemaError('a recording is a JSON object with sampleRateHz and channels', '$');
  const { sampleRateHz, unit, channels, metadata: extraMetadata, ...rest } = document;
  const rate = options.sampleRateHz ?? sampleRateHz;
  if (rate === undefined) {
    throw decodeError('sample_rate_invalid', 'The JSON recording has no sampleRateHz; add "sampleRateHz": <samples per second>.', '$.sampleRateHz');
  }
  checkSampleRate(rate, 'sampleRateHz', options.sampleRateHz === undefined ? '$.sampleRateHz' : undefined);
  if (unit !== undefined && typeof unit !== 'string') schemaError('must be a string such as "g"', '$.unit');
  if (!Array.isArray(channels)) schemaError('must be an array of { name, samples } objects', '$.channels');
  if (channels.length === 0) throw decodeError('no_samples', 'The JSON recording has an empty channels array.', '$.channels');
  checkRecordingSize(channels.length, 0, limits, '$.channels');

  let length = -1;
  const parsed: Array<{ name?: string; unit?: string; samples: Float64Array }> = channels.map((entry: unknown, c: number) => {
    const path = `$.channels[${c}]`;
    if (!isRecord(entry)) schemaError('must be an object with a samples array', path);
    if (entry.name !== undefined && typeof entry.name !== 'string') schemaError('must be a string', `${path}.name`);
    if (entry.unit !== undefined && typeof entry.unit !== 'string') schemaError('must be a string such as "g"', `${path}.unit`);
    const samples = entry.samples;
    if (!Array.isArray(samples)) schemaError('must be an array of numbers', `${path}.samples`);
    if (length < 0) {
      length = samples.length;
      checkRecordingSize(channels.length, length, limits, `${path}.samples`);
    } else if (samples.length !== length) {
      throw decodeError(
        'channel_length_mismatch',
        `Channel ${c + 1} has ${samples.length} samples but channel 1 has ${length}; every channel needs the same number.`,
        `${path}.samples`,
      );
    }
    const out = new Float64Array(samples.length);
    for (let i = 0; i < samples.length; i++) {
      const x = samples[i];
      if (typeof x !== 'number') {
        if (x === null || x === 'NaN' || x === 'Infinity' || x === '-Infinity') {
          // JSON.stringify writes NaN and Infinity as null.
          throw decodeError(
            'non_finite_sample',
            `${path}.samples[${i}] is ${JSON.stringify(x)}, the mark of a NaN or infinite value; a recording must hold finite numbers only.`,
            `${path}.samples[${i}]`,
          );
        }
        schemaError(`must be a number, not ${describe(x).slice(0, 40)}`, `${path}.samples[${i}]`);
      }
      if (!Number.isFinite(x)) {
        throw decodeError('non_finite_sample', `${path}.samples[${i}] is ${x}; a recording must hold finite numbers only.`, `${path}.samples[${i}]`);
      }
      out[i] = x;
    }
    return { name: entry.name as string | undefined, unit: entry.unit as string | undefined, samples: out };
  });
  if (length === 0) throw decodeError('no_samples', 'The JSON recording has channels but no samples.', '$.channels[0].samples');

  const names = channelNames(parsed.length, options.channelNames, parsed.map((p, c) => p.name ?? `ch${c + 1}`));
  const metadata: Record<string, string> = {};
  for (const [key, value] of Object.entries(rest)) metadata[key] = metadataValue(value);
  if (isRecord(extraMetadata)) {
    for (const [key, value] of Object.entries(extraMetadata)) metadata[key] = metadataValue(value);
  } else if (extraMetadata !== undefined) {
    metadata.metadata = metadataValue(extraMetadata);
  }
  if (options.sampleRateHz !== undefined && sampleRateHz !== undefined && options.sampleRateHz !== sampleRateHz) {
    addWarning(metadata, `the document gives sampleRateHz ${String(sampleRateHz)} but ${options.sampleRateHz} was used`);
  }
  metadata.sourceFormat = 'json';
  const out: Channel[] = parsed.map((p, c) => {
    const fileUnit = p.unit ?? (unit as string | undefined);
    if (unitOption !== undefined) {
      if (fileUnit !== undefined && canonicalChannelUnit(fileUnit) !== unitOption) addWarning(metadata, `channel '${names[c]}' says unit '${fileUnit}' but '${unitOption}' was used`);
      return { name: names[c], unit: unitOption, samples: p.samples };
    }
    if (fileUnit === undefined) return { name: names[c], unit: UNSTATED_UNIT, samples: p.samples };
    const path = p.unit !== undefined ? `$.channels[${c}].unit` : '$.unit';
    return { name: names[c], unit: checkChannelUnit(fileUnit, `channel ${c + 1} ('${names[c]}')`, path), samples: p.samples };
  });
  return { sampleRateHz: rate as number, channels: out, metadata };
}
