/*
 * Raw samples as stored: float32 little-endian, channel after channel. Float32 keeps 24 bits of
 * mantissa, as many as a 24-bit acquisition delivers, at half the bytes of float64.
 */

/** Packs channels of equal length into float32 bytes. */
export function packSamples(channels: ReadonlyArray<ArrayLike<number>>): Buffer {
  const n = channels[0]?.length ?? 0;
  const out = Buffer.alloc(4 * n * channels.length);
  let offset = 0;
  for (const samples of channels) {
    if (samples.length !== n) throw new RangeError(`every channel must hold ${n} samples (one holds ${samples.length})`);
    for (let i = 0; i < n; i++, offset += 4) out.writeFloatLE(samples[i]!, offset);
  }
  return out;
}

/** The inverse of packSamples: `channelCount` arrays of float64 (exactly the float32 values). */
export function unpackSamples(bytes: Uint8Array, channelCount: number): Float64Array[] {
  if (channelCount < 1 || bytes.byteLength % (4 * channelCount) !== 0) {
    throw new RangeError(`stored samples (${bytes.byteLength} bytes) are not a whole number of float32 frames of ${channelCount} channels`);
  }
  const n = bytes.byteLength / 4 / channelCount;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const channels: Float64Array[] = [];
  for (let c = 0; c < channelCount; c++) {
    const samples = new Float64Array(n);
    const base = c * n * 4;
    for (let i = 0; i < n; i++) samples[i] = view.getFloat32(base + 4 * i, true);
    channels.push(samples);
  }
  return channels;
}
