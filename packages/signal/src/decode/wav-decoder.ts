import type { Recording } from '../recording.js';
import { decodeError } from './decode-error.js';
import { checkRecordingSize, resolveDecodeLimits, type DecodeLimits } from './decode-limits.js';
import { addWarning, channelNames, firstNonFinite, hostIsLittleEndian, optionUnit } from './recording-parts.js';
import { channelScales, type Sensitivity } from './sensitivity.js';
import {
  EXTENSIBLE_FMT_SIZE,
  KSDATAFORMAT_SUBTYPE_TAIL,
  WAVE_FORMAT_EXTENSIBLE,
  WAVE_FORMAT_IEEE_FLOAT,
  WAVE_FORMAT_PCM,
  fourCC,
  type WavSampleFormat,
} from './wav-format.js';

export interface WavDecodeOptions {
  /** Turns digital values into engineering units: one for all channels or one per channel. */
  sensitivity?: Sensitivity | readonly Sensitivity[];
  /** Input voltage at digital full scale, for `mvPerUnit` sensitivities that do not carry their own. */
  fullScaleVolts?: number;
  /** Unit of float data that is already in engineering units (no sensitivity); default 'unknown'. */
  unit?: string;
  channelNames?: readonly string[];
  limits?: Partial<DecodeLimits>;
}

/** What the fmt chunk says, reduced to what decoding needs. */
export interface WavFormat {
  sampleFormat: WavSampleFormat;
  channelCount: number;
  sampleRateHz: number;
  blockAlign: number;
  /** Bits that carry signal; PCM samples are left-justified in their container (Microsoft, WAVEFORMATEXTENSIBLE). */
  validBits: number;
  extensible: boolean;
  channelMask?: number;
}

const compressedTags: Record<number, string> = {
  0x0002: 'Microsoft ADPCM',
  0x0006: 'A-law',
  0x0007: 'mu-law',
  0x0011: 'IMA ADPCM',
  0x0031: 'GSM 6.10',
  0x0055: 'MPEG layer 3',
};

function hex16(value: number): string {
  return `0x${value.toString(16).padStart(4, '0').toUpperCase()}`;
}

function unsupportedTag(tag: number, where: string): never {
  const name = compressedTags[tag];
  throw decodeError(
    'unsupported_format',
    `WAV sample encoding ${hex16(tag)}${name ? ` (${name})` : ''} is not read; save the recording as PCM (8/16/24/32-bit) or IEEE float (32/64-bit) WAV.`,
    where,
  );
}

/** Reads the fmt chunk body (`size` bytes at `body`). */
export function parseWavFormat(view: DataView, body: number, size: number): WavFormat {
  const where = `byte ${body - 8}`;
  if (size < 16) {
    throw decodeError('wav_format_invalid', `The 'fmt ' chunk has ${size} bytes; a WAV format chunk has at least 16.`, where);
  }
  let tag = view.getUint16(body, true);
  const channelCount = view.getUint16(body + 2, true);
  const sampleRateHz = view.getUint32(body + 4, true);
  let blockAlign = view.getUint16(body + 12, true);
  const containerBits = view.getUint16(body + 14, true);
  let validBits = containerBits;
  let channelMask: number | undefined;
  const extensible = tag === WAVE_FORMAT_EXTENSIBLE;
  if (extensible) {
    if (size < EXTENSIBLE_FMT_SIZE) {
      throw decodeError(
        'wav_format_invalid',
        `The 'fmt ' chunk says WAVE_FORMAT_EXTENSIBLE but has ${size} bytes; that layout needs ${EXTENSIBLE_FMT_SIZE}.`,
        where,
      );
    }
    const cbSize = view.getUint16(body + 16, true);
    if (cbSize < 22) {
      throw decodeError('wav_format_invalid', `WAVE_FORMAT_EXTENSIBLE needs cbSize >= 22; this file has ${cbSize}.`, where);
    }
    const declaredValidBits = view.getUint16(body + 18, true);
    // Zero means "not given" in files from some writers; then every container bit is valid.
    if (declaredValidBits !== 0) validBits = declaredValidBits;
    channelMask = view.getUint32(body + 20, true);
    const guidOffset = body + 24;
    for (let k = 0; k < KSDATAFORMAT_SUBTYPE_TAIL.length; k++) {
      if (view.getUint8(guidOffset + 2 + k) !== KSDATAFORMAT_SUBTYPE_TAIL[k]) {
        throw decodeError(
          'unsupported_format',
          'The WAVE_FORMAT_EXTENSIBLE SubFormat GUID is not the PCM or IEEE float one; save the recording as PCM or float WAV.',
          `byte ${guidOffset}`,
        );
      }
    }
    tag = view.getUint16(guidOffset, true);
  }
  if (tag !== WAVE_FORMAT_PCM && tag !== WAVE_FORMAT_IEEE_FLOAT) unsupportedTag(tag, where);
  if (channelCount === 0) throw decodeError('wav_format_invalid', 'The WAV format chunk declares 0 channels.', where);
  if (sampleRateHz === 0) throw decodeError('sample_rate_invalid', 'The WAV format chunk declares a sample rate of 0 Hz.', where);
  const containerBytes = Math.ceil(containerBits / 8);
  let sampleFormat: WavSampleFormat;
  if (tag === WAVE_FORMAT_IEEE_FLOAT) {
    if ((containerBits !== 32 && containerBits !== 64) || validBits !== containerBits) {
      throw decodeError(
        'unsupported_format',
        `IEEE float WAV data with ${validBits} of ${containerBits} bits is not read; only 32- and 64-bit float is.`,
        where,
      );
    }
    sampleFormat = containerBits === 32 ? 'float32' : 'float64';
  } else {
    if (containerBits < 1 || containerBytes > 4) {
      throw decodeError('unsupported_format', `PCM WAV data with ${containerBits} bits per sample is not read; 8 to 32 bits are.`, where);
    }
    sampleFormat = (['pcm8', 'pcm16', 'pcm24', 'pcm32'] as const)[containerBytes - 1];
  }
  if (validBits > containerBytes * 8) {
    throw decodeError(
      'wav_format_invalid',
      `The WAV format chunk declares ${validBits} valid bits in a ${containerBytes * 8}-bit sample container.`,
      where,
    );
  }
  if (blockAlign === 0) blockAlign = channelCount * containerBytes;
  if (blockAlign !== channelCount * containerBytes) {
    throw decodeError(
      'wav_format_invalid',
      `The WAV block size (${blockAlign} bytes) does not match ${channelCount} channel(s) of ${containerBytes}-byte samples.`,
      where,
    );
  }
  return { sampleFormat, channelCount, sampleRateHz, blockAlign, validBits, extensible, channelMask };
}

function printableId(bytes: Uint8Array, offset: number): boolean {
  if (offset + 8 > bytes.length) return false;
  for (let k = 0; k < 4; k++) {
    const c = bytes[offset + k];
    if (c < 0x20 || c > 0x7e) return false;
  }
  return true;
}

function readInfoList(bytes: Uint8Array, view: DataView, body: number, size: number, metadata: Record<string, string>): void {
  if (size < 4 || fourCC(bytes, body) !== 'INFO') return;
  const end = body + size;
  const text = new TextDecoder('utf-8');
  let pos = body + 4;
  while (pos + 8 <= end) {
    const id = fourCC(bytes, pos);
    const length = view.getUint32(pos + 4, true);
    if (pos + 8 + length > end) return;
    const value = text.decode(bytes.subarray(pos + 8, pos + 8 + length)).replace(/\0+$/u, '').trim();
    if (/^[A-Za-z0-9 ]{4}$/.test(id) && value !== '') metadata[`info.${id}`] = value;
    pos += 8 + length + (length & 1);
  }
}

/**
 * Decodes a RIFF/WAVE file: PCM 8 (unsigned), 16, 24 and 32-bit, IEEE float 32 and 64-bit, any channel
 * count, plain or WAVE_FORMAT_EXTENSIBLE. Unknown chunks are skipped, LIST/INFO entries go to metadata as
 * `info.<ID>`. A data chunk whose declared size runs past the end of the file (a logger that stopped early)
 * gives the complete frames present and a `metadata.warning`; a truncated header is an error.
 *
 * Units: PCM becomes ±1 at full scale (unit 'FS'; counts / 2^(bits-1), unsigned 8-bit offset by 128) unless a
 * sensitivity is given; float data keeps its values and takes `options.unit`, else 'unknown'.
 */
export function decodeWav(bytes: Uint8Array, options: WavDecodeOptions = {}): Recording {
  if (!(bytes instanceof Uint8Array)) throw decodeError('option_invalid', 'decodeWav expects the file as a Uint8Array.');
  const limits = resolveDecodeLimits(options.limits);
  const unit = optionUnit(options.unit);
  const length = bytes.length;
  if (length === 0) throw decodeError('empty_input', 'The WAV file is empty (0 bytes).');
  const magic = fourCC(bytes, 0);
  if (magic === 'RIFX' || magic === 'RF64') {
    throw decodeError('unsupported_format', `${magic} files are not read; save the recording as a plain little-endian RIFF/WAVE file.`, 'byte 0');
  }
  if (length < 12) {
    const riff = [0x52, 0x49, 0x46, 0x46, 0x00, 0x00, 0x00, 0x00, 0x57, 0x41, 0x56, 0x45];
    const prefixMatches = Array.from(bytes).every((b, k) => k >= 4 && k < 8 ? true : b === riff[k]);
    if (prefixMatches) throw decodeError('wav_truncated', `The WAV file ends after ${length} bytes, inside its 12-byte RIFF header.`);
    throw decodeError('wav_not_riff', 'The file does not start with a RIFF/WAVE header; it is not a WAV file.', 'byte 0');
  }
  if (magic !== 'RIFF' || fourCC(bytes, 8) !== 'WAVE') {
    throw decodeError('wav_not_riff', 'The file does not start with a RIFF/WAVE header; it is not a WAV file.', 'byte 0');
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const metadata: Record<string, string> = {};
  let format: WavFormat | undefined;
  let dataOffset = -1;
  let dataBytes = 0;
  let pos = 12;
  while (pos + 8 <= length) {
    const id = fourCC(bytes, pos);
    const size = view.getUint32(pos + 4, true);
    const body = pos + 8;
    const available = length - body;
    if (id === 'data') {
      if (dataOffset >= 0) {
        addWarning(metadata, `a second 'data' chunk at byte ${pos} was ignored`);
      } else {
        dataOffset = body;
        dataBytes = Math.min(size, available);
        if (size > available) {
          addWarning(
            metadata,
            `the data chunk declares ${size} bytes but the file holds ${available} after its header, so only the complete frames present were decoded`,
          );
          break;
        }
      }
    } else if (id === 'fmt ') {
      if (size > available) {
        throw decodeError(
          'wav_truncated',
          `The WAV 'fmt ' chunk declares ${size} bytes but the file ends ${available} bytes later; the file is cut short.`,
          `byte ${pos}`,
        );
      }
      if (format) addWarning(metadata, `a second 'fmt ' chunk at byte ${pos} was ignored`);
      else format = parseWavFormat(view, body, size);
    } else if (id === 'fact') {
      if (size >= 4 && available >= 4) metadata.factSampleLength = String(view.getUint32(body, true));
    } else if (id === 'LIST') {
      if (size <= available) readInfoList(bytes, view, body, size, metadata);
    }
    let next = body + size + (size & 1);
    // Some writers forget the pad byte after an odd-sized chunk: follow the unpadded position if only it looks like a chunk.
    if ((size & 1) === 1 && !printableId(bytes, next) && printableId(bytes, next - 1)) next -= 1;
    pos = next;
  }
  // A missing chunk in a file shorter than its RIFF size says is a cut file rather than a malformed one.
  const cutShort = (pos < length && pos + 8 > length) || view.getUint32(4, true) + 8 > length;
  if (!format || dataOffset < 0) {
    const id = !format ? 'fmt ' : 'data';
    if (cutShort) {
      throw decodeError('wav_truncated', `The WAV file ends at byte ${length}, before its '${id}' chunk; the file is cut short.`);
    }
    throw decodeError(
      'wav_missing_chunk',
      !format
        ? "The WAV file has no 'fmt ' chunk, so its sample encoding is unknown."
        : "The WAV file has no 'data' chunk: it holds no samples.",
    );
  }
  const frameCount = Math.floor(dataBytes / format.blockAlign);
  const leftover = dataBytes - frameCount * format.blockAlign;
  if (leftover > 0) addWarning(metadata, `the last ${leftover} byte(s) of the data chunk are an incomplete frame and were ignored`);
  if (frameCount === 0) {
    throw decodeError('no_samples', `The WAV data chunk holds no complete frame (${dataBytes} bytes, ${format.blockAlign} per frame).`, `byte ${dataOffset - 8}`);
  }
  checkRecordingSize(format.channelCount, frameCount, limits, `byte ${dataOffset - 8}`);

  const float = format.sampleFormat === 'float32' || format.sampleFormat === 'float64';
  const scales = channelScales(options.sensitivity, format.channelCount, { float, validBits: format.validBits }, { fullScaleVolts: options.fullScaleVolts, unit });
  if (!float && unit !== undefined && options.sensitivity === undefined) {
    addWarning(metadata, `unit '${unit}' was not applied: PCM data without a sensitivity is given in full-scale units (FS)`);
  }
  const names = channelNames(format.channelCount, options.channelNames);
  const factors = scales.map((s) => s.factor);
  const samples = hostIsLittleEndian
    ? decodeWavFrames(bytes, dataOffset, frameCount, format, factors)
    : decodeWavFramesPortable(bytes, dataOffset, frameCount, format, factors);
  if (float) {
    samples.forEach((channel, c) => {
      const frame = firstNonFinite(channel);
      if (frame >= 0) {
        const where = `byte ${dataOffset + frame * format!.blockAlign + c * (format!.blockAlign / format!.channelCount)}`;
        throw decodeError(
          'non_finite_sample',
          `Sample ${frame} of channel '${names[c]}' is ${String(channel[frame])}; a recording must hold finite numbers only.`,
          where,
        );
      }
    });
  }
  metadata.sourceFormat = 'wav';
  metadata.sampleFormat = format.sampleFormat;
  metadata.validBitsPerSample = String(format.validBits);
  if (format.extensible) metadata.channelMask = `0x${(format.channelMask ?? 0).toString(16).padStart(8, '0')}`;
  return {
    sampleRateHz: format.sampleRateHz,
    channels: samples.map((s, c) => ({ name: names[c], unit: scales[c].unit, samples: s })),
    metadata,
  };
}

type SampleView = Int16Array | Int32Array | Float32Array | Float64Array;

/** A typed view straight over the file bytes, or undefined when the data is not aligned for one. */
function alignedView<T extends SampleView>(
  Ctor: { new (buffer: ArrayBufferLike, byteOffset: number, length: number): T; BYTES_PER_ELEMENT: number },
  bytes: Uint8Array,
  offset: number,
  count: number,
): T | undefined {
  const absolute = bytes.byteOffset + offset;
  return absolute % Ctor.BYTES_PER_ELEMENT === 0 ? new Ctor(bytes.buffer, absolute, count) : undefined;
}

function deinterleave(source: SampleView, frameCount: number, factors: readonly number[]): Float64Array[] {
  const channelCount = factors.length;
  return factors.map((factor, c) => {
    const out = new Float64Array(frameCount);
    if (channelCount === 1 && factor === 1) {
      out.set(source);
    } else if (channelCount === 1) {
      for (let f = 0; f < frameCount; f++) out[f] = source[f] * factor;
    } else {
      for (let f = 0, j = c; f < frameCount; f++, j += channelCount) out[f] = source[j] * factor;
    }
    return out;
  });
}

/** Fast path for little-endian hosts: typed-array views over the file bytes. */
export function decodeWavFrames(
  bytes: Uint8Array,
  dataOffset: number,
  frameCount: number,
  format: WavFormat,
  factors: readonly number[],
): Float64Array[] {
  const channelCount = format.channelCount;
  const count = frameCount * channelCount;
  // Unaligned data (a float file after an 18-byte fmt chunk starts at byte 58) is read through a DataView:
  // copying it to align it would cost a fresh allocation, which is dearer than the reads.
  let view: SampleView | undefined;
  switch (format.sampleFormat) {
    case 'float32':
      view = alignedView(Float32Array, bytes, dataOffset, count);
      return view ? deinterleave(view, frameCount, factors) : decodeWavFramesPortable(bytes, dataOffset, frameCount, format, factors);
    case 'float64':
      view = alignedView(Float64Array, bytes, dataOffset, count);
      return view ? deinterleave(view, frameCount, factors) : decodeWavFramesPortable(bytes, dataOffset, frameCount, format, factors);
    case 'pcm16':
      view = alignedView(Int16Array, bytes, dataOffset, count);
      return view
        ? deinterleave(view, frameCount, factors.map((k) => k / 32768))
        : decodeWavFramesPortable(bytes, dataOffset, frameCount, format, factors);
    case 'pcm32':
      view = alignedView(Int32Array, bytes, dataOffset, count);
      return view
        ? deinterleave(view, frameCount, factors.map((k) => k / 2147483648))
        : decodeWavFramesPortable(bytes, dataOffset, frameCount, format, factors);
    case 'pcm24':
      return factors.map((factor, c) => {
        const k = factor / 8388608;
        const out = new Float64Array(frameCount);
        for (let f = 0, p = dataOffset + 3 * c; f < frameCount; f++, p += format.blockAlign) {
          // Shift the 24-bit value to the top of an int32 and back to extend its sign.
          out[f] = (((bytes[p] | (bytes[p + 1] << 8) | (bytes[p + 2] << 16)) << 8) >> 8) * k;
        }
        return out;
      });
    case 'pcm8':
      return factors.map((factor, c) => {
        const k = factor / 128;
        const out = new Float64Array(frameCount);
        // 8-bit WAV PCM is unsigned with 128 as zero (Microsoft & IBM 1991, "Data format of the samples").
        for (let f = 0, p = dataOffset + c; f < frameCount; f++, p += channelCount) out[f] = (bytes[p] - 128) * k;
        return out;
      });
  }
}

/**
 * Byte-order-independent path through a DataView: big-endian hosts, unaligned data, and in tests a
 * cross-check of the typed-array path. One loop per encoding keeps each loop monomorphic.
 */
export function decodeWavFramesPortable(
  bytes: Uint8Array,
  dataOffset: number,
  frameCount: number,
  format: WavFormat,
  factors: readonly number[],
): Float64Array[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const step = format.blockAlign;
  const width = step / format.channelCount;
  return factors.map((factor, c) => {
    const out = new Float64Array(frameCount);
    const first = dataOffset + c * width;
    switch (format.sampleFormat) {
      case 'pcm8':
        for (let f = 0, p = first; f < frameCount; f++, p += step) out[f] = ((view.getUint8(p) - 128) / 128) * factor;
        break;
      case 'pcm16':
        for (let f = 0, p = first; f < frameCount; f++, p += step) out[f] = (view.getInt16(p, true) / 32768) * factor;
        break;
      case 'pcm24':
        for (let f = 0, p = first; f < frameCount; f++, p += step) {
          out[f] = ((view.getUint8(p) + view.getUint8(p + 1) * 256 + view.getInt8(p + 2) * 65536) / 8388608) * factor;
        }
        break;
      case 'pcm32':
        for (let f = 0, p = first; f < frameCount; f++, p += step) out[f] = (view.getInt32(p, true) / 2147483648) * factor;
        break;
      case 'float32':
        for (let f = 0, p = first; f < frameCount; f++, p += step) out[f] = view.getFloat32(p, true) * factor;
        break;
      case 'float64':
        for (let f = 0, p = first; f < frameCount; f++, p += step) out[f] = view.getFloat64(p, true) * factor;
        break;
    }
    return out;
  });
}
