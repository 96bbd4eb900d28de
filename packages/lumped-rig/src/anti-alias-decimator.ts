/**
 * The data-acquisition anti-alias filter and sample-rate reduction: the rig integrates at a multiple N of the
 * output rate, so content above the output Nyquist frequency (tooth-force harmonics, impact edges) must be removed
 * before every N-th sample is kept, as a logger's anti-alias filter does.
 *
 * Linear-phase FIR: windowed sinc with a Blackman window (Oppenheim & Schafer, Discrete-Time Signal Processing,
 * §7.5, window method; Blackman's first sidelobe is −58 dB and its transition about 5.5/L of the input rate wide,
 * from memory). With L = TAPS_PER_FACTOR·N + 1 taps the transition is about 0.09 of the output rate.
 */
export const TAPS_PER_FACTOR = 64;

/** Cut-off (−6 dB point of the windowed sinc) as a fraction of the output sample rate. */
export const CUTOFF_FRACTION_OF_OUTPUT_RATE = 0.46;

export function antiAliasTaps(factor: number): Float64Array {
  if (!(Number.isInteger(factor) && factor >= 1)) throw new RangeError(`factor (${factor}) must be a whole number >= 1`);
  const L = TAPS_PER_FACTOR * factor + 1;
  const fc = CUTOFF_FRACTION_OF_OUTPUT_RATE / factor; // cycles per input sample
  const mid = (L - 1) / 2;
  const taps = new Float64Array(L);
  let sum = 0;
  for (let i = 0; i < L; i++) {
    const x = i - mid;
    const sinc = x === 0 ? 2 * fc : Math.sin(2 * Math.PI * fc * x) / (Math.PI * x);
    // Blackman window (symmetric), a0 = 0.42, a1 = 0.5, a2 = 0.08 (Harris 1978, Proc. IEEE 66:51-83).
    const w = 0.42 - 0.5 * Math.cos((2 * Math.PI * i) / (L - 1)) + 0.08 * Math.cos((4 * Math.PI * i) / (L - 1));
    taps[i] = sinc * w;
    sum += taps[i]!;
  }
  // Unit gain at DC.
  for (let i = 0; i < L; i++) taps[i] = taps[i]! / sum;
  return taps;
}

/**
 * Output sample m is the filtered input at index offset + m·factor, for `count` outputs. The caller keeps
 * (L − 1)/2 input samples of margin on both sides of the span it wants, so that no output sees the edges.
 */
export function decimate(input: Float64Array, factor: number, offset: number, count: number): Float64Array {
  if (factor === 1) return input.slice(offset, offset + count);
  const taps = antiAliasTaps(factor);
  const half = (taps.length - 1) / 2;
  if (offset - half < 0 || offset + (count - 1) * factor + half >= input.length) {
    throw new RangeError(`decimate: input (${input.length} samples) too short for ${count} outputs at offset ${offset} with ${half} samples of margin`);
  }
  const out = new Float64Array(count);
  for (let m = 0; m < count; m++) {
    const start = offset + m * factor - half;
    let acc = 0;
    for (let j = 0; j < taps.length; j++) acc += taps[j]! * input[start + j]!;
    out[m] = acc;
  }
  return out;
}
