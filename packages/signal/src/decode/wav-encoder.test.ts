import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { codeOf } from '../../../../tests/support/signal-error-code.js';
import type { Recording } from '../recording.js';
import { decodeWav } from './wav-decoder.js';
import { encodeWav } from './wav-encoder.js';
import { wavSampleFormats, type WavSampleFormat } from './wav-format.js';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../../../fixtures/decode/${name}`, import.meta.url)));
const mono = (samples: number[], sampleRateHz = 8000): Recording => ({
  sampleRateHz,
  channels: [{ name: 'ch1', unit: 'FS', samples: Float64Array.from(samples) }],
  metadata: {},
});

const bitsOf: Record<WavSampleFormat, number> = { pcm8: 8, pcm16: 16, pcm24: 24, pcm32: 32, float32: 32, float64: 64 };

describe('encodeWav', () => {
  it('writes the same bytes as scipy.io.wavfile.write for int16, int32 and float32 (check-values §11)', () => {
    expect(Array.from(encodeWav(mono([0, 1, -1, 2].map((v) => v / 32768)), { format: 'pcm16' }))).toEqual(
      Array.from(fixture('scipy-ref-int16.wav')),
    );
    expect(Array.from(encodeWav(mono([0, 1, -1, 2].map((v) => v / 2 ** 31)), { format: 'pcm32' }))).toEqual(
      Array.from(fixture('scipy-ref-int32.wav')),
    );
    expect(Array.from(encodeWav(mono([0, 1, -1, 2]), { format: 'float32' }))).toEqual(Array.from(fixture('scipy-ref-float32.wav')));
  });

  it('writes the scipy stereo int16 fixture byte for byte from its decoded values', () => {
    const file = fixture('pcm16-stereo-8000.wav');
    expect(Array.from(encodeWav(decodeWav(file), { format: 'pcm16' }))).toEqual(Array.from(file));
  });

  it('writes an extensible fmt chunk of 40 bytes with the SubFormat GUID (Microsoft Learn, WAVEFORMATEXTENSIBLE)', () => {
    const bytes = encodeWav(mono([0.5, -0.25]), { format: 'pcm24', extensible: true });
    const view = new DataView(bytes.buffer);
    expect(view.getUint32(16, true)).toBe(40);
    expect(view.getUint16(20, true)).toBe(0xfffe);
    expect(view.getUint16(36, true)).toBe(22);
    expect(view.getUint16(38, true)).toBe(24);
    expect(Array.from(bytes.subarray(44, 60))).toEqual([1, 0, 0, 0, 0, 0, 0x10, 0, 0x80, 0, 0, 0xaa, 0, 0x38, 0x9b, 0x71]);
    expect(Array.from(decodeWav(bytes).channels[0].samples)).toEqual([0.5, -0.25]);
  });

  it('round-trips every format, plain and extensible, within half a count', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...wavSampleFormats),
        fc.boolean(),
        fc.integer({ min: 1, max: 4 }),
        fc.integer({ min: 1, max: 50 }),
        fc.integer({ min: 1, max: 384000 }),
        fc.infiniteStream(fc.double({ min: -1, max: 1, noNaN: true })),
        (format, extensible, channelCount, frameCount, sampleRateHz, values) => {
          const recording: Recording = {
            sampleRateHz,
            channels: Array.from({ length: channelCount }, (_, c) => ({
              name: `ch${c + 1}`,
              unit: 'FS',
              samples: Float64Array.from({ length: frameCount }, () => values.next().value),
            })),
            metadata: {},
          };
          const decoded = decodeWav(encodeWav(recording, { format, extensible }), { unit: 'FS' });
          expect(decoded.sampleRateHz).toBe(sampleRateHz);
          expect(decoded.metadata.sampleFormat).toBe(format);
          decoded.channels.forEach((channel, c) => {
            const input = recording.channels[c].samples;
            channel.samples.forEach((x, i) => {
              if (format === 'float64') expect(x).toBe(input[i]);
              else if (format === 'float32') expect(x).toBe(Math.fround(input[i]));
              else {
                const lsb = 2 ** (1 - bitsOf[format]);
                // +1.0 clips to the largest count, one LSB below full scale.
                const clipped = Math.min(input[i], 1 - lsb);
                expect(Math.abs(x - clipped)).toBeLessThanOrEqual(lsb / 2);
              }
            });
          });
        },
      ),
      { numRuns: 400 },
    );
  });

  it('scales PCM by fullScale and clips beyond it', () => {
    const decoded = decodeWav(encodeWav(mono([25, -50, 80]), { format: 'pcm16', fullScale: 50 }), { sensitivity: { fullScaleUnits: 50, unit: 'g' } });
    expect(Array.from(decoded.channels[0].samples)).toEqual([25, -50, 50 * (32767 / 32768)]);
  });

  it('stores info.XXXX metadata as LIST/INFO entries', () => {
    const recording = { ...mono([0.1, 0.2, 0.3]), metadata: { 'info.INAM': 'Fan 2 NDE', 'info.ICMT': 'odd', other: 'not written' } };
    const decoded = decodeWav(encodeWav(recording, { format: 'float64' }));
    expect(decoded.metadata['info.INAM']).toBe('Fan 2 NDE');
    expect(decoded.metadata['info.ICMT']).toBe('odd');
    expect(decoded.metadata.other).toBeUndefined();
  });

  it('refuses recordings a WAV file cannot hold', () => {
    expect(codeOf(() => encodeWav(mono([0], 25600.5), { format: 'pcm16' }))).toBe('sample_rate_invalid');
    expect(codeOf(() => encodeWav(mono([0, NaN]), { format: 'float32' }))).toBe('non_finite_sample');
    expect(codeOf(() => encodeWav(mono([0]), { format: 'pcm12' as WavSampleFormat }))).toBe('option_invalid');
    const uneven: Recording = {
      sampleRateHz: 100,
      channels: [
        { name: 'a', unit: 'g', samples: new Float64Array(3) },
        { name: 'b', unit: 'g', samples: new Float64Array(2) },
      ],
      metadata: {},
    };
    expect(codeOf(() => encodeWav(uneven, { format: 'float32' }))).toBe('channel_length_mismatch');
  });
});
