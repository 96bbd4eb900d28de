import type { Recording } from '../recording.js';
import { decodeError } from './decode-error.js';
import { checkRecordingSize, resolveDecodeLimits, type DecodeLimits } from './decode-limits.js';
import { UNSTATED_UNIT } from '../units/channel-units.js';
import { channelNames, checkSampleRate, firstNonFinite, hostIsLittleEndian, optionUnit } from './recording-parts.js';

export interface RawDecodeOptions {
  /** Sample encoding: little-endian IEEE float. */
  format: 'float32' | 'float64';
  sampleRateHz: number;
  /** Unit of the samples; default 'unknown'. */
  unit?: string;
  /** Interleaved channels (frame = one sample of each); default 1. */
  channels?: number;
  channelNames?: readonly string[];
  limits?: Partial<DecodeLimits>;
}

/** Decodes headerless little-endian float32/float64 samples, the metadata given separately. */
export function decodeRaw(bytes: Uint8Array, options: RawDecodeOptions): Recording {
  if (!(bytes instanceof Uint8Array)) throw decodeError('option_invalid', 'decodeRaw expects the file as a Uint8Array.');
  if (options === null || typeof options !== 'object') {
    throw decodeError('option_invalid', 'decodeRaw needs options { format, sampleRateHz }.');
  }
  const { format } = options;
  if (format !== 'float32' && format !== 'float64') {
    throw decodeError('option_invalid', `format (${String(format)}) must be 'float32' or 'float64' for raw samples.`);
  }
  const limits = resolveDecodeLimits(options.limits);
  const sampleRateHz = checkSampleRate(options.sampleRateHz, 'sampleRateHz');
  const channelCount = options.channels ?? 1;
  if (!Number.isInteger(channelCount) || channelCount < 1) {
    throw decodeError('option_invalid', `channels (${String(channelCount)}) must be a positive whole number.`);
  }
  checkRecordingSize(channelCount, 0, limits);
  if (bytes.length === 0) throw decodeError('empty_input', 'The raw recording is empty (0 bytes).');
  const width = format === 'float32' ? 4 : 8;
  const frameBytes = width * channelCount;
  if (bytes.length % frameBytes !== 0) {
    throw decodeError(
      'raw_size_mismatch',
      `${bytes.length} bytes is not a whole number of ${channelCount}-channel ${format} frames (${frameBytes} bytes each); check the format and channel count, or whether the file is cut short.`,
    );
  }
  const frameCount = bytes.length / frameBytes;
  checkRecordingSize(channelCount, frameCount, limits);
  const names = channelNames(channelCount, options.channelNames);
  const unit = optionUnit(options.unit) ?? UNSTATED_UNIT;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // Aligned data is read through a typed view over the bytes; unaligned data (a Node Buffer cut from the
  // shared pool can start anywhere) through the DataView, which costs less than copying it into alignment.
  let source: Float32Array | Float64Array | undefined;
  if (hostIsLittleEndian && bytes.byteOffset % width === 0) {
    source =
      format === 'float32'
        ? new Float32Array(bytes.buffer, bytes.byteOffset, frameCount * channelCount)
        : new Float64Array(bytes.buffer, bytes.byteOffset, frameCount * channelCount);
  }
  const channels = names.map((name, c) => {
    const samples = new Float64Array(frameCount);
    if (source && channelCount === 1) samples.set(source);
    else if (source) for (let f = 0, j = c; f < frameCount; f++, j += channelCount) samples[f] = source[j];
    else {
      for (let f = 0; f < frameCount; f++) {
        const p = (f * channelCount + c) * width;
        samples[f] = width === 4 ? view.getFloat32(p, true) : view.getFloat64(p, true);
      }
    }
    const bad = firstNonFinite(samples);
    if (bad >= 0) {
      throw decodeError(
        'non_finite_sample',
        `Sample ${bad} of channel '${name}' is ${samples[bad]}; a recording must hold finite numbers only (or the format or channel count is wrong).`,
        `byte ${(bad * channelCount + c) * width}`,
      );
    }
    return { name, unit, samples };
  });
  return { sampleRateHz, channels, metadata: { sourceFormat: 'raw', sampleFormat: format } };
}
