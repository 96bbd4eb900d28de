// Builds a 16-bit PCM WAV in memory (RIFF/WAVE, format tag 1 — Microsoft/IBM RIFF specification, 1991).

export function pcm16Wav(samples: Float64Array, sampleRateHz: number): Buffer {
  const dataBytes = samples.length * 2;
  const buf = Buffer.alloc(44 + dataBytes);
  buf.write('RIFF', 0, 'ascii');
  buf.writeUInt32LE(36 + dataBytes, 4);
  buf.write('WAVE', 8, 'ascii');
  buf.write('fmt ', 12, 'ascii');
  buf.writeUInt32LE(16, 16);
  buf.writeUInt16LE(1, 20); // PCM
  buf.writeUInt16LE(1, 22); // mono
  buf.writeUInt32LE(sampleRateHz, 24);
  buf.writeUInt32LE(sampleRateHz * 2, 28);
  buf.writeUInt16LE(2, 32);
  buf.writeUInt16LE(16, 34);
  buf.write('data', 36, 'ascii');
  buf.writeUInt32LE(dataBytes, 40);
  let peak = 0;
  for (const s of samples) peak = Math.max(peak, Math.abs(s));
  const scale = peak > 0 ? 32000 / peak : 0;
  samples.forEach((s, i) => buf.writeInt16LE(Math.round(s * scale), 44 + 2 * i));
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
