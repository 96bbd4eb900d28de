/*
 * Raw samples as stored: float32 little-endian, channel after channel. Float32 keeps 24 bits of
 * mantissa, as many as a 24-bit acquisition delivers, at half the bytes of float64.
 */

const littleEndianHost = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** Packs channels of equal length into float32 bytes (IEEE 754 rounding to nearest). */
export function packSamples(channels: ReadonlyArray<ArrayLike<number>>): Buffer {
  const n = channels[0]?.length ?? 0;
  const out = Buffer.alloc(4 * n * channels.length);
  const view = new DataView(out.buffer, out.byteOffset, out.byteLength);
  channels.forEach((samples, c) => {
    if (samples.length !== n) throw new RangeError(`every channel must hold ${n} samples (one holds ${samples.length})`);
    if (littleEndianHost) {
      new Float32Array(out.buffer, out.byteOffset + 4 * n * c, n).set(samples);
    } else {
      for (let i = 0; i < n; i++) view.setFloat32(4 * (n * c + i), samples[i]!, true);
    }
  });
  return out;
}

/** The inverse of packSamples: `channelCount` arrays of float64 (exactly the float32 values). */
export function unpackSamples(bytes: Uint8Array, channelCount: number): Float64Array[] {
  if (channelCount < 1 || bytes.byteLength % (4 * channelCount) !== 0) {
    throw new RangeError(`stored samples (${bytes.byteLength} bytes) are not a whole number of float32 frames of ${channelCount} channels`);
  }
  const n = bytes.byteLength / 4 / channelCount;
  // a copy, so the float32 view is aligned whatever the offset of the driver's buffer
  const aligned = new Uint8Array(bytes);
  const view = new DataView(aligned.buffer);
  const channels: Float64Array[] = [];
  for (let c = 0; c < channelCount; c++) {
    if (littleEndianHost) {
      channels.push(new Float64Array(new Float32Array(aligned.buffer, 4 * n * c, n)));
    } else {
      const samples = new Float64Array(n);
      for (let i = 0; i < n; i++) samples[i] = view.getFloat32(4 * (n * c + i), true);
      channels.push(samples);
    }
  }
  return channels;
}

/** Rounds every sample to the float32 nearest it, in place: the values unpackSamples(packSamples(x)) gives. */
export function roundToFloat32(samples: Float64Array): Float64Array {
  for (let i = 0; i < samples.length; i++) samples[i] = Math.fround(samples[i]!);
  return samples;
}
