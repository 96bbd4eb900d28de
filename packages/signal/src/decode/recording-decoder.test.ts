import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { codeOf } from '../../../../tests/support/signal-error-code.js';
import { SignalInputError } from '../errors.js';
import { decodeRecording, detectRecordingFormat } from './recording-decoder.js';
import { encodeWav } from './wav-encoder.js';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../../../fixtures/decode/${name}`, import.meta.url)));
const text = (s: string) => new TextEncoder().encode(s);

describe('detectRecordingFormat', () => {
  it('prefers the explicit format, then RIFF magic, Content-Type, extension, sampleFormat and content', () => {
    const wav = fixture('pcm16-stereo-8000.wav');
    expect(detectRecordingFormat(wav, { format: 'raw' })).toBe('raw');
    expect(detectRecordingFormat(wav, { filename: 'x.csv', contentType: 'text/csv' })).toBe('wav');
    expect(detectRecordingFormat(text('1,2'), { contentType: 'application/json; charset=utf-8', filename: 'a.csv' })).toBe('json');
    expect(detectRecordingFormat(text('1,2'), { contentType: 'application/vnd.kinespec+json' })).toBe('json');
    expect(detectRecordingFormat(text('{}'), { contentType: 'application/octet-stream', filename: 'A.CSV' })).toBe('csv');
    expect(detectRecordingFormat(new Uint8Array(8), { filename: 'run.f32' })).toBe('raw');
    expect(detectRecordingFormat(new Uint8Array(8), { sampleFormat: 'float64' })).toBe('raw');
    expect(detectRecordingFormat(text(' \n{"a":1}'))).toBe('json');
    expect(detectRecordingFormat(text('{"a":1}'), { contentType: 'text/plain' })).toBe('json');
    expect(detectRecordingFormat(text('\ufefftime,x\n0,1\n'))).toBe('csv');
    expect(codeOf(() => detectRecordingFormat(Uint8Array.from([0, 1, 2, 255])))).toBe('unsupported_format');
    expect(codeOf(() => detectRecordingFormat(text('1'), { format: 'mp3' as 'wav' }))).toBe('option_invalid');
  });
});

describe('decodeRecording', () => {
  it('decodes WAV, CSV, JSON and raw through one call', () => {
    expect(decodeRecording(fixture('pcm24-stereo-48000.wav')).channels).toHaveLength(2);
    expect(decodeRecording(fixture('comments-fixed-semicolon.csv')).sampleRateHz).toBe(2000);
    expect(decodeRecording(fixture('time-ms-tab-crlf.csv'), { timeColumn: 0, timeUnit: 'ms' }).sampleRateHz).toBe(5000);
    const json = decodeRecording(text('{"sampleRateHz": 10, "channels": [{"samples": [1, 2]}]}'), { unit: 'g' });
    expect(json.channels[0]).toMatchObject({ unit: 'g' });
    const raw = decodeRecording(new Uint8Array(Float32Array.from([1, 2, 3, 4]).buffer), { filename: 'a.f32', sampleRateHz: 100, channels: 2 });
    expect(raw.channels.map((c) => Array.from(c.samples))).toEqual([
      [1, 3],
      [2, 4],
    ]);
  });

  it('passes WAV options through: sensitivity and channel names', () => {
    const r = decodeRecording(fixture('pcm16-stereo-8000.wav'), {
      sensitivity: { mvPerUnit: 100, unit: 'g' },
      fullScaleVolts: 5,
      channelNames: ['NDE', 'DE'],
    });
    expect(r.channels.map((c) => [c.name, c.unit])).toEqual([
      ['NDE', 'g'],
      ['DE', 'g'],
    ]);
    // -32768 counts is -1 FS, -5 V, and at 100 mV/g, -50 g.
    expect(r.channels[0].samples[0]).toBe(-50);
  });

  it('asks for what raw samples need', () => {
    expect(codeOf(() => decodeRecording(new Uint8Array(8), { format: 'raw', sampleRateHz: 10 }))).toBe('option_invalid');
    expect(codeOf(() => decodeRecording(new Uint8Array(8), { filename: 'a.f64' }))).toBe('sample_rate_invalid');
    expect(codeOf(() => decodeRecording(new Uint8Array(0)))).toBe('empty_input');
  });

  it('round-trips random recordings through encodeWav (float64) and the format sniffer', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 200000 }),
        fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 2, maxLength: 40 }),
        (sampleRateHz, xs) => {
          const recording = { sampleRateHz, channels: [{ name: 'ch1', unit: 'g', samples: Float64Array.from(xs) }], metadata: {} };
          const r = decodeRecording(encodeWav(recording, { format: 'float64' }), { unit: 'g' });
          expect(r.sampleRateHz).toBe(sampleRateHz);
          expect(r.channels[0].samples).toEqual(recording.channels[0].samples);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('throws nothing but SignalInputError on random bytes and hints', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.uint8Array({ maxLength: 300 }), fc.string({ maxLength: 200 }).map(text)),
        fc.record(
          {
            format: fc.constantFrom('wav' as const, 'csv' as const, 'json' as const, 'raw' as const),
            sampleRateHz: fc.oneof(fc.double(), fc.integer({ min: 1, max: 100000 })),
            sampleFormat: fc.constantFrom('float32' as const, 'float64' as const),
            channels: fc.integer({ min: 1, max: 4 }),
            timeColumn: fc.oneof(fc.constant(false as const), fc.integer({ min: 0, max: 3 }), fc.string({ maxLength: 4 })),
          },
          { requiredKeys: [] },
        ),
        (bytes, hint) => {
          try {
            const r = decodeRecording(bytes, hint);
            expect(r.sampleRateHz).toBeGreaterThan(0);
            for (const c of r.channels) expect(c.samples.every((x) => Number.isFinite(x))).toBe(true);
          } catch (error) {
            expect(error).toBeInstanceOf(SignalInputError);
          }
        },
      ),
      { numRuns: 3000 },
    );
  });
});
