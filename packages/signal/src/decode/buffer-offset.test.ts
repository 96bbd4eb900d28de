import { describe, expect, it } from 'vitest';
import { decodeRaw, decodeWav, encodeWav } from './index.js';

// Node's readFileSync returns Buffers cut from a shared pool at any byte offset; Buffer#slice shares
// memory, so a decoder must copy (not slice) when float data is not aligned for a typed-array view.
// Expected values are the inputs themselves (exactly representable in float32).
const oddOffset = (bytes: Uint8Array): Buffer => Buffer.concat([Buffer.from([7]), Buffer.from(bytes)]).subarray(1);

describe('decoders on Node Buffers at odd offsets', () => {
  it('decodeRaw reads float32 data that starts at an odd byte offset', () => {
    const data = new Float32Array([1.5, 2.5, -3, 0.125]);
    const bytes = oddOffset(new Uint8Array(data.buffer));
    expect(bytes.byteOffset % 4).not.toBe(0);
    const rec = decodeRaw(bytes, { format: 'float32', sampleRateHz: 100, unit: 'g' });
    expect(Array.from(rec.channels[0].samples)).toEqual([1.5, 2.5, -3, 0.125]);
  });

  it('decodeWav reads float32 WAV data that starts at an odd byte offset', () => {
    const samples = Float64Array.from([0.5, -0.25, 1, 2]);
    const wav = encodeWav({ sampleRateHz: 1000, channels: [{ name: 'a', unit: 'g', samples }], metadata: {} }, { format: 'float32' });
    const rec = decodeWav(oddOffset(wav));
    expect(Array.from(rec.channels[0].samples)).toEqual([0.5, -0.25, 1, 2]);
  });
});
