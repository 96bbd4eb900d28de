import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { codeOf } from '../../../../tests/support/signal-error-code.js';
import { SignalInputError } from '../errors.js';
import { decodeRaw } from './raw-decoder.js';

describe('decodeRaw', () => {
  it('reads little-endian float32 and float64 (IEEE 754 bit patterns written by DataView)', () => {
    const bytes = new Uint8Array(16);
    const view = new DataView(bytes.buffer);
    [1.5, -2, 0.1, 1e-3].forEach((x, i) => view.setFloat32(4 * i, x, true));
    const r = decodeRaw(bytes, { format: 'float32', sampleRateHz: 1000, unit: 'g' });
    expect(Array.from(r.channels[0].samples)).toEqual([1.5, -2, Math.fround(0.1), Math.fround(1e-3)]);
    expect(r.channels[0]).toMatchObject({ name: 'ch1', unit: 'g' });
    expect(r.metadata).toEqual({ sourceFormat: 'raw', sampleFormat: 'float32' });
    // 0x3FF0000000000000 is 1.0 in binary64.
    const one = Uint8Array.from([0, 0, 0, 0, 0, 0, 0xf0, 0x3f]);
    expect(Array.from(decodeRaw(one, { format: 'float64', sampleRateHz: 1 }).channels[0].samples)).toEqual([1]);
  });

  it('splits interleaved channels and names them', () => {
    const bytes = new Uint8Array(Float64Array.from([1, 10, 2, 20, 3, 30]).buffer);
    const r = decodeRaw(bytes, { format: 'float64', sampleRateHz: 50, channels: 2, channelNames: ['x', 'y'] });
    expect(r.channels.map((c) => [c.name, Array.from(c.samples)])).toEqual([
      ['x', [1, 2, 3]],
      ['y', [10, 20, 30]],
    ]);
  });

  it('reads an unaligned view of the bytes', () => {
    const backing = new Uint8Array(13);
    new DataView(backing.buffer).setFloat64(1, 42.25, true);
    new DataView(backing.buffer).setFloat32(9, -7.5, true);
    expect(Array.from(decodeRaw(backing.subarray(1, 9), { format: 'float64', sampleRateHz: 1 }).channels[0].samples)).toEqual([42.25]);
    expect(Array.from(decodeRaw(backing.subarray(9, 13), { format: 'float32', sampleRateHz: 1 }).channels[0].samples)).toEqual([-7.5]);
  });

  it('rejects bad sizes, bad options and non-finite samples', () => {
    expect(codeOf(() => decodeRaw(new Uint8Array(6), { format: 'float32', sampleRateHz: 1 }))).toBe('raw_size_mismatch');
    expect(codeOf(() => decodeRaw(new Uint8Array(8), { format: 'float32', sampleRateHz: 1, channels: 3 }))).toBe('raw_size_mismatch');
    expect(codeOf(() => decodeRaw(new Uint8Array(0), { format: 'float32', sampleRateHz: 1 }))).toBe('empty_input');
    expect(codeOf(() => decodeRaw(new Uint8Array(4), { format: 'float32', sampleRateHz: 0 }))).toBe('sample_rate_invalid');
    expect(codeOf(() => decodeRaw(new Uint8Array(4), { format: 'int16' as 'float32', sampleRateHz: 1 }))).toBe('option_invalid');
    expect(codeOf(() => decodeRaw(new Uint8Array(4), { format: 'float32', sampleRateHz: 1, channels: 0 }))).toBe('option_invalid');
    expect(codeOf(() => decodeRaw(new Uint8Array(8), { format: 'float32', sampleRateHz: 1, limits: { maxSamplesPerChannel: 1 } }))).toBe('too_large');
    const nan = new Uint8Array(Float32Array.from([1, NaN]).buffer);
    expect(codeOf(() => decodeRaw(nan, { format: 'float32', sampleRateHz: 1 }))).toBe('non_finite_sample');
  });

  it('round-trips random float64 frames and throws only SignalInputError on random bytes', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 1, maxLength: 50 }), (xs) => {
        const r = decodeRaw(new Uint8Array(Float64Array.from(xs).buffer), { format: 'float64', sampleRateHz: 10 });
        expect(Array.from(r.channels[0].samples)).toEqual(xs);
      }),
    );
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 64 }), fc.constantFrom('float32' as const, 'float64' as const), fc.integer({ min: 1, max: 3 }), (bytes, format, channels) => {
        try {
          decodeRaw(bytes, { format, sampleRateHz: 10, channels });
        } catch (error) {
          expect(error).toBeInstanceOf(SignalInputError);
        }
      }),
      { numRuns: 1000 },
    );
  });
  it('refuses a unit it does not know', () => {
    const bytes = new Uint8Array(new Float32Array([1, 2]).buffer);
    expect(codeOf(() => decodeRaw(bytes, { format: 'float32', sampleRateHz: 100, unit: 'furlongs' }))).toBe('unknown_unit');
    expect(decodeRaw(bytes, { format: 'float32', sampleRateHz: 100, unit: 'ips' }).channels[0]!.unit).toBe('in/s');
  });
});
