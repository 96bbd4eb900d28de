import { spectraError } from './spectra-error.js';

/**
 * Per-segment trend removal before windowing, as scipy.signal.welch's `detrend`:
 * 'mean' is scipy's 'constant' (the default), 'linear' removes the least-squares line, 'none' keeps the data.
 */
export type DetrendMode = 'mean' | 'linear' | 'none';

export const DETREND_MODES: readonly DetrendMode[] = ['mean', 'linear', 'none'];

export function assertDetrendMode(mode: string, parameter = 'detrend'): DetrendMode {
  if (!(DETREND_MODES as readonly string[]).includes(mode)) {
    throw spectraError('unknown_detrend', `${parameter} '${mode}' is not one of ${DETREND_MODES.join(', ')}`);
  }
  return mode as DetrendMode;
}

/**
 * The trend of x[start .. start+length) as [value at i = 0, slope per sample], i the index within
 * the segment. 'mean' gives [mean, 0]; 'linear' the least-squares line; 'none' [0, 0].
 */
export function trendOf(x: ArrayLike<number>, start: number, length: number, mode: DetrendMode): [number, number] {
  if (mode === 'none' || length === 0) return [0, 0];
  let sum = 0;
  for (let i = 0; i < length; i++) sum += x[start + i];
  const mean = sum / length;
  if (mode === 'mean' || length < 2) return [mean, 0];
  // Least squares about the centre index c = (L-1)/2: slope = sum (i-c)(x-mean) / sum (i-c)^2
  const c = (length - 1) / 2;
  let sxy = 0;
  for (let i = 0; i < length; i++) sxy += (i - c) * (x[start + i] - mean);
  // sum_{i=0}^{L-1} (i-c)^2 = L(L^2-1)/12
  const sxx = (length * (length * length - 1)) / 12;
  const slope = sxy / sxx;
  return [mean - slope * c, slope];
}

/** A detrended copy of the whole record. */
export function detrend(samples: Float64Array, mode: DetrendMode = 'mean'): Float64Array {
  const [offset, slope] = trendOf(samples, 0, samples.length, assertDetrendMode(mode));
  const out = new Float64Array(samples.length);
  for (let i = 0; i < samples.length; i++) out[i] = samples[i] - (offset + slope * i);
  return out;
}
