import { spectraError } from './spectra-error.js';
import type { Spectrum } from './spectrum.js';

/**
 * Default width of the running median, in bins. 63 lines is wide enough that a family of
 * harmonics a few bins apart (each line 2-10 bins wide depending on the window) still leaves
 * more than half the window on the floor, and narrow enough to follow a sloping floor.
 */
export const DEFAULT_NOISE_FLOOR_WIDTH_BINS = 63;

/**
 * Centred running median of odd width; near the ends the window shrinks to the bins available.
 * The median ignores narrow peaks that cover less than half the window (J. W. Tukey,
 * Exploratory Data Analysis, Addison-Wesley 1977: running medians as smoothers).
 */
export function runningMedian(values: Float64Array, widthBins: number): Float64Array {
  if (!(Number.isInteger(widthBins) && widthBins >= 1 && widthBins % 2 === 1)) {
    throw spectraError('invalid_width', `widthBins (${widthBins}) must be an odd integer >= 1`);
  }
  const n = values.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const h = (widthBins - 1) / 2;
  // sorted copy of the current window, kept by binary insertion and removal
  const win: number[] = [];
  let lo = 0;
  let hi = -1;
  for (let i = 0; i < n; i++) {
    const wantLo = Math.max(0, i - h);
    const wantHi = Math.min(n - 1, i + h);
    while (hi < wantHi) insertSorted(win, values[++hi]);
    while (lo < wantLo) removeSorted(win, values[lo++]);
    const m = win.length;
    out[i] = m % 2 === 1 ? win[(m - 1) / 2] : 0.5 * (win[m / 2 - 1] + win[m / 2]);
  }
  return out;
}

function lowerBound(a: number[], v: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function insertSorted(a: number[], v: number): void {
  a.splice(lowerBound(a, v), 0, v);
}

function removeSorted(a: number[], v: number): void {
  a.splice(lowerBound(a, v), 1);
}

/** Local noise floor of a spectrum, in the spectrum's own units: running median of its values. */
export function noiseFloor(spectrum: Spectrum, widthBins: number = DEFAULT_NOISE_FLOOR_WIDTH_BINS): Float64Array {
  return runningMedian(spectrum.values, widthBins);
}
