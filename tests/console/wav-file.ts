// Builds mono WAV files in memory (RIFF/WAVE: format tag 1 PCM, 3 IEEE float — Microsoft/IBM RIFF specification, 1991).

/** The 44-byte header of a mono WAV with a 16-byte 'fmt ' chunk. */
function wavHeader(buf: Buffer, formatTag: 1 | 3, bytesPerSample: number, sampleRateHz: number, dataBytes: number): void {
  buf.write('RIFF', 0, 'ascii');
  buf.writeUInt32LE(36 + dataBytes, 4);
  buf.write('WAVE', 8, 'ascii');
  buf.write('fmt ', 12, 'ascii');
  buf.writeUInt32LE(16, 16);
  buf.writeUInt16LE(formatTag, 20);
  buf.writeUInt16LE(1, 22); // mono
  buf.writeUInt32LE(sampleRateHz, 24);
  buf.writeUInt32LE(sampleRateHz * bytesPerSample, 28);
  buf.writeUInt16LE(bytesPerSample, 32);
  buf.writeUInt16LE(8 * bytesPerSample, 34);
  buf.write('data', 36, 'ascii');
  buf.writeUInt32LE(dataBytes, 40);
}

export function pcm16Wav(samples: Float64Array, sampleRateHz: number): Buffer {
  const dataBytes = samples.length * 2;
  const buf = Buffer.alloc(44 + dataBytes);
  wavHeader(buf, 1, 2, sampleRateHz, dataBytes);
  let peak = 0;
  for (const s of samples) peak = Math.max(peak, Math.abs(s));
  const scale = peak > 0 ? 32000 / peak : 0;
  samples.forEach((s, i) => buf.writeInt16LE(Math.round(s * scale), 44 + 2 * i));
  return buf;
}

/** A 32-bit IEEE-float mono WAV: values as they are, no unit in the file. */
export function floatWav(samples: Float64Array, sampleRateHz: number): Buffer {
  const dataBytes = samples.length * 4;
  const buf = Buffer.alloc(44 + dataBytes);
  wavHeader(buf, 3, 4, sampleRateHz, dataBytes);
  samples.forEach((s, i) => buf.writeFloatLE(s, 44 + 4 * i));
  return buf;
}

/** Sum of sines: [frequencyHz, amplitude] pairs. */
export function sines(components: Array<[number, number]>, sampleRateHz: number, count: number): Float64Array {
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const t = i / sampleRateHz;
    for (const [f, a] of components) out[i]! += a * Math.sin(2 * Math.PI * f * t);
  }
  return out;
}

