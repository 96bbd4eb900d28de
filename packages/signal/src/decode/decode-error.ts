import { SignalInputError } from '../errors.js';

/**
 * Every code a decoder throws, with the meaning a problem-type registry can use as its title.
 * The codes are stable: the HTTP service maps them to problem types and the CLI to exit code 2.
 */
export const decodeErrorDescriptions = {
  empty_input: 'The input has no bytes, or only blank and comment lines.',
  no_samples: 'The input is well formed but holds no complete sample.',
  too_large: 'The recording has more channels or samples than the decode limits allow.',
  unsupported_format: 'The format, or the sample encoding inside it, is not one Kinespec reads.',
  option_invalid: 'A decoder option is missing or out of range.',
  sensitivity_invalid: 'A sensitivity given to turn digital values into engineering units is incomplete or out of range.',
  sample_rate_invalid: 'The sample rate is missing, zero, negative or not a finite number.',
  non_finite_sample: 'A sample is NaN or infinite.',
  channel_length_mismatch: 'The channels of one recording have different numbers of samples.',
  wav_not_riff: 'The bytes do not start with a RIFF/WAVE header.',
  wav_truncated: 'The WAV header or one of its format chunks is cut short.',
  wav_format_invalid: 'The WAV format chunk is inconsistent (channels, block size or bit depth).',
  wav_missing_chunk: "The WAV file lacks its 'fmt ' or 'data' chunk.",
  csv_column_count: 'A CSV line has a different number of cells than the first data line.',
  csv_non_numeric: 'A CSV cell that should hold a number does not.',
  csv_time_invalid: 'The CSV time column cannot give a sample rate (unknown unit, too few rows, or time not increasing).',
  csv_uneven_time: 'The CSV time column is not evenly spaced.',
  json_syntax: 'The input is not valid JSON.',
  json_schema: 'The JSON document does not have the recording shape.',
  raw_size_mismatch: 'The raw byte count is not a whole number of frames.',
  unknown_unit: 'A unit given for the samples (option, header, comment or field) is not one Kinespec knows.',
} as const satisfies Record<string, string>;

export type DecodeErrorCode = keyof typeof decodeErrorDescriptions;

/** The codes above as a list, for registries that iterate them. */
export const decodeErrorCodes = Object.freeze(Object.keys(decodeErrorDescriptions) as DecodeErrorCode[]);

/** Builds the typed error; decoders `throw decodeError(...)` so that only registered codes exist. */
export function decodeError(code: DecodeErrorCode, message: string, where?: string): SignalInputError {
  return new SignalInputError(code, message, where);
}
