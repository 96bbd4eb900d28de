import { inverseComplexSpectrum, realToComplexSpectrum } from '@kinespec/signal';
import { SimulatorInputError } from './errors.js';

/** Shares of the noise power in each colour; they are normalised to sum to 1. */
export interface NoiseColour {
  /** Flat power spectral density (sensor and amplifier noise). */
  white?: number;
  /** PSD falling as 1/f (flicker noise of electronics, broadband process noise). */
  pink?: number;
  /** PSD falling as 1/f² (a random walk: cable motion, thermal drift, low-frequency process noise). */
  brown?: number;
}

/** Below this frequency the 1/f and 1/f² laws are held flat, so a long record does not put all its power near DC. */
export const COLOURED_NOISE_CORNER_HZ = 2;

/**
 * Gaussian noise of unit r.m.s. whose power is split between white, pink (1/f) and brown (1/f²) parts.
 * Each coloured part is white noise shaped in the frequency domain by |H(f)| = (f / f_c)^(−α/2)
 * (α = 1 pink, 2 brown), flat below the corner f_c, and scaled to unit r.m.s. over the record.
 */
// Kasdin (1995), "Discrete simulation of colored noise and stochastic processes and 1/f^α power law noise generation", Proc. IEEE 83(5):802-827 (from memory): shape white Gaussian noise by f^(−α/2).
export function colouredNoise(sampleCount: number, sampleRateHz: number, colour: NoiseColour, normal: () => number): Float64Array {
  const shares = { white: colour.white ?? 0, pink: colour.pink ?? 0, brown: colour.brown ?? 0 };
  for (const [name, share] of Object.entries(shares)) {
    if (!(Number.isFinite(share) && share >= 0)) {
      throw new SimulatorInputError('invalid_noise', `noise.colour.${name} (${share}) must be a number >= 0`);
    }
  }
  const total = shares.white + shares.pink + shares.brown;
  if (!(total > 0)) throw new SimulatorInputError('invalid_noise', 'noise.colour needs at least one share > 0 (white, pink or brown)');
  const out = new Float64Array(sampleCount);
  const parts: Array<[share: number, alpha: number]> = [
    [shares.white / total, 0],
    [shares.pink / total, 1],
    [shares.brown / total, 2],
  ];
  for (const [share, alpha] of parts) {
    if (share === 0) continue;
    const part = shapedNoise(sampleCount, sampleRateHz, alpha, normal);
    // Independent parts: powers add, so each is weighted by the square root of its share.
    const weight = Math.sqrt(share);
    for (let i = 0; i < sampleCount; i++) out[i] += weight * part[i]!;
  }
  return out;
}

/** White Gaussian noise shaped to a PSD ∝ f^(−alpha), scaled to unit r.m.s. */
function shapedNoise(n: number, sampleRateHz: number, alpha: number, normal: () => number): Float64Array {
  const white = new Float64Array(n);
  for (let i = 0; i < n; i++) white[i] = normal();
  if (alpha === 0) return unitRms(white);
  const spectrum = realToComplexSpectrum(white);
  for (let k = 0; k < n; k++) {
    // Bin k and bin n − k hold the same frequency (conjugate pair), so the result stays real.
    const frequencyHz = (Math.min(k, n - k) * sampleRateHz) / n;
    const gain = k === 0 ? 0 : Math.max(frequencyHz, COLOURED_NOISE_CORNER_HZ) ** (-alpha / 2);
    spectrum[2 * k] *= gain;
    spectrum[2 * k + 1] *= gain;
  }
  const back = inverseComplexSpectrum(spectrum);
  const real = new Float64Array(n);
  for (let i = 0; i < n; i++) real[i] = back[2 * i]!;
  return unitRms(real);
}

function unitRms(x: Float64Array): Float64Array {
  let sum = 0;
  for (const v of x) sum += v * v;
  const rms = Math.sqrt(sum / x.length);
  if (rms > 0) for (let i = 0; i < x.length; i++) x[i] /= rms;
  return x;
}
