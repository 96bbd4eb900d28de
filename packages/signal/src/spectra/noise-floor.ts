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
 * The result equals sorting each window with a stable sort and taking its middle value (the mean of the
 * two middle values for an even window at the ends), down to the sign of a zero.
 */
export function runningMedian(values: Float64Array, widthBins: number): Float64Array {
  if (!(Number.isInteger(widthBins) && widthBins >= 1 && widthBins % 2 === 1)) {
    throw spectraError('invalid_width', `widthBins (${widthBins}) must be an odd integer >= 1`);
  }
  const n = values.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const h = (widthBins - 1) / 2;
  // The current window, sorted, equal values in the order they entered (as a stable sort leaves them): a new
  // value goes after its equals and the one leaving, the oldest in the window, is the first of its equals.
  // Sliding replaces the leaving value by the entering one in place and shifts only the values between
  // their two ranks.
  const win = new Float64Array(Math.min(widthBins, n));
  let m = 0;
  let lo = 0;
  let hi = -1;
  for (let i = 0; i < n; i++) {
    const wantLo = Math.max(0, i - h);
    const wantHi = Math.min(n - 1, i + h);
    if (hi < wantHi && lo < wantLo) {
      replaceSorted(win, m, values[lo++], values[++hi]);
    }
    while (hi < wantHi) {
      const v = values[++hi];
      let k = m++;
      while (k > 0 && win[k - 1] > v) {
        win[k] = win[k - 1];
        k--;
      }
      win[k] = v;
    }
    while (lo < wantLo) {
      const k = lowerBound(win, m, values[lo++]);
      win.copyWithin(k, k + 1, m);
      m--;
    }
    out[i] = m % 2 === 1 ? win[(m - 1) / 2] : 0.5 * (win[m / 2 - 1] + win[m / 2]);
  }
  return out;
}

/** First index of win[0..m) whose value is not below v. */
function lowerBound(win: Float64Array, m: number, v: number): number {
  let lo = 0;
  let hi = m;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (win[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Takes `leaving` (the oldest of its equals) out of the sorted win[0..m) and puts `entering` in, after its equals. */
function replaceSorted(win: Float64Array, m: number, leaving: number, entering: number): void {
  const k = lowerBound(win, m, leaving);
  // Rank of the entering value among the others: after every value not above it. A long move (a smooth,
  // monotone stretch of a spectrum sends each new value across the whole window) is one block copy.
  let p: number;
  if (k + 1 < m && win[k + 1] <= entering) {
    // Moves up: the first value above it, from k + 1 on.
    let lo = k + 1;
    let hi = m;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (win[mid] <= entering) lo = mid + 1;
      else hi = mid;
    }
    p = lo - 1;
    if (p - k > 12) win.copyWithin(k, k + 1, p + 1);
    else for (let j = k; j < p; j++) win[j] = win[j + 1];
  } else if (k > 0 && win[k - 1] > entering) {
    // Moves down: the first value above it, before k.
    let lo = 0;
    let hi = k;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (win[mid] <= entering) lo = mid + 1;
      else hi = mid;
    }
    p = lo;
    if (k - p > 12) win.copyWithin(p + 1, p, k);
    else for (let j = k; j > p; j--) win[j] = win[j - 1];
  } else p = k;
  win[p] = entering;
}

/** Local noise floor of a spectrum, in the spectrum's own units: running median of its values. */
export function noiseFloor(spectrum: Spectrum, widthBins: number = DEFAULT_NOISE_FLOOR_WIDTH_BINS): Float64Array {
  return runningMedian(spectrum.values, widthBins);
}
