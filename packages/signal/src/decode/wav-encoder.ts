import type { Recording } from '../recording.js';
import { decodeError } from './decode-error.js';
import { hostIsLittleEndian } from './recording-parts.js';
import {
  EXTENSIBLE_FMT_SIZE,
  KSDATAFORMAT_SUBTYPE_TAIL,
  WAVE_FORMAT_EXTENSIBLE,
  WAVE_FORMAT_IEEE_FLOAT,
  WAVE_FORMAT_PCM,
  sampleFormatBytes,
  wavSampleFormats,
  type WavSampleFormat,
} from './wav-format.js';

export interface WavEncodeOptions {
  format: WavSampleFormat;
  /** Write a WAVE_FORMAT_EXTENSIBLE fmt chunk (40 bytes, SubFormat GUID) instead of the plain one. */
  extensible?: boolean;
  /** For PCM: the sample value written as digital full scale (default 1, so ±1 spans the PCM range). */
  fullScale?: number;
}

function ascii(out: Uint8Array, offset: number, text: string): void {
  for (let k = 0; k < text.length; k++) out[offset + k] = text.charCodeAt(k);
}

function infoEntries(metadata: Record<string, string>): Array<[string, Uint8Array]> {
  const encoder = new TextEncoder();
  return Object.entries(metadata)
    .filter(([key, value]) => /^info\.[A-Za-z0-9 ]{4}$/.test(key) && value !== '')
    .map(([key, value]) => [key.slice(5), encoder.encode(`${value}\0`)]);
}

/**
 * Writes a recording as a RIFF/WAVE file. The plain layouts match scipy.io.wavfile.write byte for byte:
 * PCM with a 16-byte fmt chunk; IEEE float with an 18-byte fmt chunk (cbSize 0) and a `fact` chunk, as the
 * 1994 Microsoft multimedia data note asks of non-PCM formats. PCM values are rounded to the nearest count
 * and clipped to the signed range (8-bit is stored unsigned, offset 128). `metadata` keys `info.XXXX`
 * become LIST/INFO entries after the data.
 */
export function encodeWav(recording: Recording, options: WavEncodeOptions): Uint8Array {
  const { format } = options;
  if (!wavSampleFormats.includes(format)) {
    throw decodeError('option_invalid', `format (${String(format)}) must be one of ${wavSampleFormats.join(', ')}.`);
  }
  const rate = recording.sampleRateHz;
  if (!Number.isInteger(rate) || rate < 1 || rate > 0xffffffff) {
    throw decodeError('sample_rate_invalid', `sampleRateHz (${rate}) must be a positive whole number to be stored in a WAV file.`);
  }
  const channelCount = recording.channels.length;
  if (channelCount < 1 || channelCount > 0xffff) {
    throw decodeError('option_invalid', `A WAV file holds 1 to 65535 channels; the recording has ${channelCount}.`);
  }
  const frameCount = recording.channels[0].samples.length;
  recording.channels.forEach((ch, c) => {
    if (ch.samples.length !== frameCount) {
      throw decodeError(
        'channel_length_mismatch',
        `Channel '${ch.name}' has ${ch.samples.length} samples but channel 1 has ${frameCount}; every WAV channel has the same length.`,
        `channels[${c}]`,
      );
    }
  });
  const fullScale = options.fullScale ?? 1;
  if (!(fullScale > 0) || !Number.isFinite(fullScale)) {
    throw decodeError('option_invalid', `fullScale (${fullScale}) must be a positive number.`);
  }
  const width = sampleFormatBytes(format);
  const float = format === 'float32' || format === 'float64';
  const extensible = options.extensible === true;
  const blockAlign = width * channelCount;
  if (blockAlign > 0xffff) throw decodeError('too_large', `A WAV frame of ${blockAlign} bytes does not fit the 16-bit block size field.`);
  const dataBytes = frameCount * blockAlign;
  const fmtSize = extensible ? EXTENSIBLE_FMT_SIZE : float ? 18 : 16;
  const withFact = extensible || float;
  const info = infoEntries(recording.metadata ?? {});
  const listSize = info.length === 0 ? 0 : 4 + info.reduce((n, [, text]) => n + 8 + text.length + (text.length & 1), 0);
  const total =
    12 + 8 + fmtSize + (withFact ? 12 : 0) + 8 + dataBytes + (dataBytes & 1) + (listSize > 0 ? 8 + listSize : 0);
  if (total - 8 > 0xffffffff) throw decodeError('too_large', `The WAV file would be ${total} bytes; RIFF sizes stop at 4 GiB.`);

  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  ascii(out, 0, 'RIFF');
  view.setUint32(4, total - 8, true);
  ascii(out, 8, 'WAVE');
  let pos = 12;
  ascii(out, pos, 'fmt ');
  view.setUint32(pos + 4, fmtSize, true);
  const tag = float ? WAVE_FORMAT_IEEE_FLOAT : WAVE_FORMAT_PCM;
  view.setUint16(pos + 8, extensible ? WAVE_FORMAT_EXTENSIBLE : tag, true);
  view.setUint16(pos + 10, channelCount, true);
  view.setUint32(pos + 12, rate, true);
  view.setUint32(pos + 16, rate * blockAlign, true);
  view.setUint16(pos + 20, blockAlign, true);
  view.setUint16(pos + 22, width * 8, true);
  if (extensible) {
    // Microsoft Learn, WAVEFORMATEXTENSIBLE: cbSize 22, wValidBitsPerSample, dwChannelMask, SubFormat GUID.
    view.setUint16(pos + 24, 22, true);
    view.setUint16(pos + 26, width * 8, true);
    // Mask 0: channels are sensors, not assigned to speaker positions.
    view.setUint32(pos + 28, 0, true);
    view.setUint16(pos + 32, tag, true);
    out.set(KSDATAFORMAT_SUBTYPE_TAIL, pos + 34);
  } else if (float) {
    view.setUint16(pos + 24, 0, true);
  }
  pos += 8 + fmtSize;
  if (withFact) {
    ascii(out, pos, 'fact');
    view.setUint32(pos + 4, 4, true);
    view.setUint32(pos + 8, frameCount, true);
    pos += 12;
  }
  ascii(out, pos, 'data');
  view.setUint32(pos + 4, dataBytes, true);
  pos += 8;
  writeSamples(out, view, pos, recording, format, fullScale);
  pos += dataBytes + (dataBytes & 1);
  if (listSize > 0) {
    ascii(out, pos, 'LIST');
    view.setUint32(pos + 4, listSize, true);
    ascii(out, pos + 8, 'INFO');
    pos += 12;
    for (const [id, text] of info) {
      ascii(out, pos, id);
      view.setUint32(pos + 4, text.length, true);
      out.set(text, pos + 8);
      pos += 8 + text.length + (text.length & 1);
    }
  }
  return out;
}

function writeSamples(
  out: Uint8Array,
  view: DataView,
  offset: number,
  recording: Recording,
  format: WavSampleFormat,
  fullScale: number,
): void {
  const channels = recording.channels.map((c) => c.samples);
  const channelCount = channels.length;
  const frameCount = channels[0].length;
  const width = sampleFormatBytes(format);
  const float = format === 'float32' || format === 'float64';
  const bits = width * 8;
  const countsPerFullScale = 2 ** (bits - 1);
  const min = -countsPerFullScale;
  const max = countsPerFullScale - 1;
  const k = countsPerFullScale / fullScale;
  channels.forEach((samples, c) => {
    for (let f = 0; f < frameCount; f++) {
      const x = samples[f];
      if (x - x !== 0) {
        throw decodeError(
          'non_finite_sample',
          `Sample ${f} of channel '${recording.channels[c].name}' is ${x}; only finite samples can be written.`,
          `channels[${c}].samples[${f}]`,
        );
      }
    }
  });
  const interleaved =
    format === 'float32'
      ? new Float32Array(frameCount * channelCount)
      : format === 'float64'
        ? new Float64Array(frameCount * channelCount)
        : format === 'pcm16'
          ? new Int16Array(frameCount * channelCount)
          : format === 'pcm32'
            ? new Int32Array(frameCount * channelCount)
            : undefined;
  if (interleaved && hostIsLittleEndian) {
    for (let c = 0; c < channelCount; c++) {
      const samples = channels[c];
      if (float) {
        for (let f = 0, j = c; f < frameCount; f++, j += channelCount) interleaved[j] = samples[f];
      } else {
        for (let f = 0, j = c; f < frameCount; f++, j += channelCount) {
          const q = Math.round(samples[f] * k);
          interleaved[j] = q < min ? min : q > max ? max : q;
        }
      }
    }
    out.set(new Uint8Array(interleaved.buffer), offset);
    return;
  }
  for (let c = 0; c < channelCount; c++) {
    const samples = channels[c];
    for (let f = 0; f < frameCount; f++) {
      const p = offset + (f * channelCount + c) * width;
      const x = samples[f];
      if (format === 'float32') view.setFloat32(p, x, true);
      else if (format === 'float64') view.setFloat64(p, x, true);
      else {
        const r = Math.round(x * k);
        const q = r < min ? min : r > max ? max : r;
        if (format === 'pcm8') out[p] = q + 128;
        else if (format === 'pcm16') view.setInt16(p, q, true);
        else if (format === 'pcm32') view.setInt32(p, q, true);
        else {
          out[p] = q & 0xff;
          out[p + 1] = (q >> 8) & 0xff;
          out[p + 2] = (q >> 16) & 0xff;
        }
      }
    }
  }
}
