import { basename } from 'node:path';
import { SignalInputError, checkChannelUnit, decodeRecording, type Channel, type Recording } from '@kinespec/signal';
import { CliError } from './cli-error.js';
import { positiveNumber } from './flags.js';
import { readInputFile } from './input-file.js';

/** What the decoder is told about a file that does not say it itself (raw floats, CSV without comments). */
export interface DecoderHint {
  sampleRateHz?: number;
  unit?: string;
}

/** The flags every verb that reads a recording file takes for what the file may not say. */
export const recordingHintFlags = {
  'sample-rate-hz': { type: 'string' },
  unit: { type: 'string' },
} as const;

/** Usage text of those flags. */
export const RECORDING_HINT_USAGE = '[--sample-rate-hz F] [--unit g]';

/** The unit of --unit in its canonical spelling; an unknown one is a one-line error listing the accepted units. */
export function unitFlag(text: string | undefined): string | undefined {
  if (text === undefined) return undefined;
  try {
    return checkChannelUnit(text, '--unit');
  } catch (err) {
    if (err instanceof SignalInputError) throw new CliError(err.message);
    throw err;
  }
}

/** The decoder hint from --sample-rate-hz and --unit (either may be absent). */
export function decoderHint(sampleRateText: string | undefined, unitText: string | undefined): DecoderHint {
  const sampleRateHz = positiveNumber('sample-rate-hz', sampleRateText, 'a sample rate in Hz > 0');
  const unit = unitFlag(unitText);
  return { ...(sampleRateHz !== undefined ? { sampleRateHz } : {}), ...(unit !== undefined ? { unit } : {}) };
}

/** The one recording file of a verb's positionals. */
export function recordingFileArgument(positionals: readonly string[], usage: string): string {
  if (positionals.length === 0) throw new CliError(`a recording file is required (usage: ${usage})`);
  if (positionals.length > 1) throw new CliError(`one recording file at a time (got ${positionals.length})`);
  return positionals[0]!;
}

/**
 * Reads and decodes a recording file; the file name's extension helps pick the decoder. The bytes go to
 * the decoder as a plain Uint8Array view over the Buffer readFileSync returns (no copy), so that the
 * decoder sees Uint8Array semantics: Buffer.slice shares memory where Uint8Array.slice copies.
 */
export function loadRecordingFile(path: string, hint: DecoderHint = {}): Recording {
  const buffer = readInputFile(path);
  return decodeRecording(new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength), { filename: basename(path), ...hint });
}

/**
 * The 0-based index of the channel a flag names: an exact channel name, else a 1-based channel number.
 * A selector that matches neither lists the channels: "--channel '3' matches no channel; the recording has 1 'x', 2 'y'".
 */
export function channelIndex(recording: Recording, selector: string, flag = 'channel'): number {
  const channels = recording.channels;
  const byName = channels.findIndex((c) => c.name === selector);
  if (byName >= 0) return byName;
  const n = Number(selector);
  if (Number.isInteger(n) && n >= 1 && n <= channels.length) return n - 1;
  const names = channels.map((c, i) => `${i + 1} '${c.name}'`).join(', ');
  throw new CliError(`--${flag} '${selector}' matches no channel; the recording has ${names}`);
}

/** The channel a flag names (see channelIndex); the first channel when the flag is absent. */
export function selectChannel(recording: Recording, selector: string | undefined, flag = 'channel'): Channel {
  return recording.channels[selector === undefined ? 0 : channelIndex(recording, selector, flag)]!;
}

type ErrorClass = abstract new (...args: never[]) => Error;

/**
 * Runs `work` on a recording file; an input error of the packages (SignalInputError, or the classes given)
 * becomes a one-line CliError that starts with the file's name: "p2.csv: the sample rate is missing ...".
 */
export function withFileNameOnInputErrors<T>(file: string, work: () => T, inputErrors: readonly ErrorClass[] = [SignalInputError]): T {
  try {
    return work();
  } catch (err) {
    if (inputErrors.some((E) => err instanceof E)) throw new CliError(`${basename(file)}: ${(err as Error).message}`);
    throw err;
  }
}
