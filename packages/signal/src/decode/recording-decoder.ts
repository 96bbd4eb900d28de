import type { Recording } from '../recording.js';
import { decodeCsv, type CsvDecodeOptions } from './csv-decoder.js';
import { decodeError } from './decode-error.js';
import type { DecodeLimits } from './decode-limits.js';
import { decodeJsonRecording } from './json-decoder.js';
import { decodeRaw } from './raw-decoder.js';
import type { Sensitivity } from './sensitivity.js';
import { decodeWav } from './wav-decoder.js';

export type RecordingFormat = 'wav' | 'csv' | 'json' | 'raw';

export const recordingFormats: readonly RecordingFormat[] = ['wav', 'csv', 'json', 'raw'];

/** What the caller knows about the bytes, plus the options of whichever decoder runs. */
export interface DecodeHint {
  /** Skips detection. */
  format?: RecordingFormat;
  /** File name; its extension (.wav, .csv, .tsv, .txt, .json, .f32, .f64, .raw, .bin) helps detection. */
  filename?: string;
  /** HTTP Content-Type; parameters such as `; charset=utf-8` are ignored. */
  contentType?: string;
  /** CSV, JSON, raw: sample rate (overrides the file's; required for raw). */
  sampleRateHz?: number;
  /** CSV, JSON, raw, float WAV: unit of the samples. */
  unit?: string;
  channelNames?: readonly string[];
  limits?: Partial<DecodeLimits>;
  /** WAV: digital values to engineering units. */
  sensitivity?: Sensitivity | readonly Sensitivity[];
  fullScaleVolts?: number;
  /** CSV options. */
  separator?: CsvDecodeOptions['separator'];
  header?: boolean;
  timeColumn?: string | number | false;
  timeUnit?: CsvDecodeOptions['timeUnit'];
  /** Raw: sample encoding and interleaved channel count. */
  sampleFormat?: 'float32' | 'float64';
  channels?: number;
}

const contentTypes: Record<string, RecordingFormat> = {
  'audio/wav': 'wav',
  'audio/x-wav': 'wav',
  'audio/wave': 'wav',
  'audio/vnd.wave': 'wav',
  'text/csv': 'csv',
  'application/csv': 'csv',
  'text/tab-separated-values': 'csv',
  'application/json': 'json',
};

const extensions: Record<string, RecordingFormat> = {
  wav: 'wav',
  wave: 'wav',
  csv: 'csv',
  tsv: 'csv',
  txt: 'csv',
  json: 'json',
  f32: 'raw',
  f64: 'raw',
  raw: 'raw',
  bin: 'raw',
};

function extensionOf(filename: string | undefined): string | undefined {
  const m = filename ? /\.([A-Za-z0-9]+)$/.exec(filename) : null;
  return m ? m[1].toLowerCase() : undefined;
}

function looksLikeText(bytes: Uint8Array): boolean {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) return true;
  const n = Math.min(bytes.length, 4096);
  for (let i = 0; i < n; i++) {
    const b = bytes[i];
    if (b === 0 || (b < 0x20 && b !== 9 && b !== 10 && b !== 13)) return false;
  }
  return true;
}

function firstTextChar(bytes: Uint8Array): number {
  let i = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  if (bytes[0] === 0xff && bytes[1] === 0xfe) i = 2;
  for (; i < Math.min(bytes.length, 4096); i++) {
    const b = bytes[i];
    if (b !== 0x20 && b !== 9 && b !== 10 && b !== 13 && b !== 0) return b;
  }
  return -1;
}

/**
 * Picks the decoder: an explicit `format`, else RIFF magic, else the Content-Type, else the file
 * extension, else `sampleFormat` (raw), else the content ('{' or '[' is JSON, other text is CSV).
 * Generic types (text/plain, application/octet-stream) say nothing and leave it to the later rules.
 */
export function detectRecordingFormat(bytes: Uint8Array, hint: DecodeHint = {}): RecordingFormat {
  if (hint.format !== undefined) {
    if (!recordingFormats.includes(hint.format)) {
      throw decodeError('option_invalid', `format (${String(hint.format)}) must be one of ${recordingFormats.join(', ')}.`);
    }
    return hint.format;
  }
  if (bytes.length >= 4 && bytes[0] === 0x52 && bytes[1] === 0x49 && bytes[2] === 0x46 && (bytes[3] === 0x46 || bytes[3] === 0x58)) {
    return 'wav';
  }
  const type = hint.contentType?.split(';')[0].trim().toLowerCase();
  if (type) {
    const byType = contentTypes[type] ?? (type.endsWith('+json') ? 'json' : undefined);
    if (byType) return byType;
  }
  const byExtension = extensions[extensionOf(hint.filename) ?? ''];
  if (byExtension) return byExtension;
  if (hint.sampleFormat !== undefined) return 'raw';
  if (looksLikeText(bytes)) {
    const c = firstTextChar(bytes);
    return c === 0x7b || c === 0x5b ? 'json' : 'csv';
  }
  throw decodeError(
    'unsupported_format',
    'The recording format cannot be told from its bytes: send a WAV, CSV or JSON file, or give raw float samples with their sampleFormat and sampleRateHz.',
  );
}

/** Decodes a recording of any supported format; what the CLI and the HTTP service call. */
export function decodeRecording(bytes: Uint8Array, hint: DecodeHint = {}): Recording {
  if (!(bytes instanceof Uint8Array)) throw decodeError('option_invalid', 'decodeRecording expects the file as a Uint8Array.');
  if (bytes.length === 0) throw decodeError('empty_input', 'The recording is empty (0 bytes).');
  const format = detectRecordingFormat(bytes, hint);
  const common = { channelNames: hint.channelNames, limits: hint.limits };
  switch (format) {
    case 'wav':
      return decodeWav(bytes, { ...common, sensitivity: hint.sensitivity, fullScaleVolts: hint.fullScaleVolts, unit: hint.unit });
    case 'csv':
      return decodeCsv(bytes, {
        ...common,
        separator: hint.separator,
        header: hint.header,
        timeColumn: hint.timeColumn,
        timeUnit: hint.timeUnit,
        sampleRateHz: hint.sampleRateHz,
        unit: hint.unit,
      });
    case 'json':
      return decodeJsonRecording(bytes, { ...common, sampleRateHz: hint.sampleRateHz, unit: hint.unit });
    case 'raw': {
      const ext = extensionOf(hint.filename);
      const sampleFormat = hint.sampleFormat ?? (ext === 'f32' ? 'float32' : ext === 'f64' ? 'float64' : undefined);
      if (sampleFormat === undefined) {
        throw decodeError('option_invalid', "Raw samples need their sampleFormat ('float32' or 'float64') and sampleRateHz.");
      }
      if (hint.sampleRateHz === undefined) {
        throw decodeError('sample_rate_invalid', 'Raw samples carry no sample rate: give sampleRateHz.');
      }
      return decodeRaw(bytes, {
        ...common,
        format: sampleFormat,
        sampleRateHz: hint.sampleRateHz,
        unit: hint.unit,
        channels: hint.channels,
      });
    }
  }
}
