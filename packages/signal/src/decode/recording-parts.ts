import { checkChannelUnit } from '../units/channel-units.js';
import { decodeError } from './decode-error.js';

/** The caller's `unit` option in its canonical spelling; an unknown unit is refused ('unknown_unit'). */
export function optionUnit(unit: string | undefined): string | undefined {
  if (unit === undefined) return undefined;
  if (typeof unit !== 'string') throw decodeError('option_invalid', `unit (${String(unit)}) must be a string such as 'g'.`);
  return checkChannelUnit(unit, 'unit');
}

/** Between two warnings in `metadata.warning` (metadata values are strings, so the list is joined). */
const WARNING_SEPARATOR = '; ';

/** Appends a warning to `metadata.warning`; decoders warn instead of failing when the data is still sound. */
export function addWarning(metadata: Record<string, string>, text: string): void {
  metadata.warning = metadata.warning ? `${metadata.warning}${WARNING_SEPARATOR}${text}` : text;
}

/** The decoder's warnings of a recording, one string each (none when `metadata.warning` is absent). */
export function recordingWarnings(metadata: Readonly<Record<string, string>> | null | undefined): string[] {
  const text = metadata?.warning;
  return text ? text.split(WARNING_SEPARATOR).filter((w) => w !== '') : [];
}

/** Channel names from an option, else from the file, else ch1, ch2, ... */
export function channelNames(
  count: number,
  fromOption: readonly string[] | undefined,
  fromFile?: readonly string[],
): string[] {
  if (fromOption !== undefined) {
    if (!Array.isArray(fromOption) || fromOption.length !== count || fromOption.some((n) => typeof n !== 'string')) {
      throw decodeError(
        'option_invalid',
        `channelNames must list ${count} name${count === 1 ? '' : 's'}, one per channel; got ${Array.isArray(fromOption) ? fromOption.length : typeof fromOption}.`,
      );
    }
    return [...fromOption];
  }
  if (fromFile !== undefined && fromFile.length === count) return [...fromFile];
  return Array.from({ length: count }, (_, i) => `ch${i + 1}`);
}

/** Throws `sample_rate_invalid` unless the rate is a positive finite number. */
export function checkSampleRate(sampleRateHz: unknown, source: string, where?: string): number {
  if (typeof sampleRateHz !== 'number' || !Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    throw decodeError(
      'sample_rate_invalid',
      `${source} (${String(sampleRateHz)}) must be a positive number of samples per second.`,
      where,
    );
  }
  return sampleRateHz;
}

/** Index of the first NaN or infinite value, or -1. */
export function firstNonFinite(samples: Float64Array): number {
  for (let i = 0; i < samples.length; i++) {
    const x = samples[i];
    // x - x is 0 for every finite x and NaN for NaN and both infinities.
    if (x - x !== 0) return i;
  }
  return -1;
}

/** True on little-endian hosts, where typed-array views read little-endian file data directly. */
export const hostIsLittleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
