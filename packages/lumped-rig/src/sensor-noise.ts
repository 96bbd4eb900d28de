import type { Random } from './random.js';

/**
 * Electrical noise of the accelerometer and its amplifier, added to the output samples: white (the broadband
 * floor) or pink (1/f, the flicker noise that dominates an IEPE sensor's low end; common practice).
 *
 * Pink noise is white noise through a bank of first-order low-pass sections with corners f_i spaced by a factor of
 * 4 and gains ∝ f_i^(−1/2): below a corner a section is flat, above it falls at 20 dB/decade, so the sum's
 * magnitude goes as f^(−1/2) and its power as 1/f between the lowest and highest corners (the idea behind
 * Voss-McCartney and Kellet's filter-bank pink noise; this design is ours, its slope is checked in the tests).
 */
export type NoiseColour = 'white' | 'pink';

/** Lowest corner of the pink bank, Hz: below it the noise is flat (a sensor's high-pass keeps it bounded anyway). */
export const PINK_LOWEST_CORNER_HZ = 1;

export function sensorNoise(random: Random, count: number, sampleRateHz: number, rms: number, colour: NoiseColour): Float64Array {
  if (!(Number.isInteger(count) && count >= 0)) throw new RangeError(`count (${count}) must be a whole number >= 0`);
  if (!(sampleRateHz > 0)) throw new RangeError(`sampleRateHz (${sampleRateHz}) must be > 0`);
  if (!(rms >= 0)) throw new RangeError(`rms (${rms}) must be >= 0`);
  const out = new Float64Array(count);
  if (count === 0 || rms === 0) return out;
  if (colour === 'white') {
    for (let k = 0; k < count; k++) out[k] = rms * random.normal();
    return out;
  }
  const corners: number[] = [];
  for (let f = PINK_LOWEST_CORNER_HZ; f < sampleRateHz / 2; f *= 4) corners.push(f);
  // One-pole low-pass y[n] = a·y[n−1] + (1 − a)·x[n], a = exp(−2π f_c / f_s) (impulse invariance).
  const poles = corners.map((f) => Math.exp((-2 * Math.PI * f) / sampleRateHz));
  // Every section has unit gain at DC (the 1 − a factor) and sees the same white input, so the bank's transfer is
  // Σ g_i / (1 + j f/f_i): with g_i ∝ f_i^(−1/2) it is dominated near any f by the sections with f_i ≈ f, |H| ∝ f^(−1/2).
  const gains = corners.map((f) => 1 / Math.sqrt(f));
  const states = new Float64Array(corners.length);
  let sumSquares = 0;
  for (let k = 0; k < count; k++) {
    const x = random.normal();
    let y = 0;
    for (let i = 0; i < poles.length; i++) {
      const a = poles[i]!;
      states[i] = a * states[i]! + (1 - a) * x;
      y += gains[i]! * states[i]!;
    }
    out[k] = y;
    sumSquares += y * y;
  }
  // Scale to the requested r.m.s. (the filter bank's own gain is of no interest).
  const scale = rms / Math.sqrt(sumSquares / count);
  for (let k = 0; k < count; k++) out[k] = out[k]! * scale;
  return out;
}
