import { spectraError } from './spectra-error.js';
import { assertBand, type BandHz } from './band-rms.js';
import { DEFAULT_NOISE_FLOOR_WIDTH_BINS, noiseFloor } from './noise-floor.js';
import { binPower, valueFromPower, type Spectrum } from './spectrum.js';
import { windowAmplitudeResponse, type WindowName } from './window.js';

/** A spectral line found by peak picking. */
export interface SpectralPeak {
  /** Interpolated frequency of the tone. */
  frequencyHz: number;
  /** Interpolated height in the spectrum's own scaling and `valueUnit` (the bin-centred reading). */
  amplitude: number;
  /** RMS amplitude of the tone in the spectrum's signal `unit` (peak = sqrt(2) x rms for a sine). */
  rmsAmplitude: number;
  /** Index of the highest bin. */
  bin: number;
  /** Interpolated offset of the tone from that bin, in bins (-0.5 .. 0.5). */
  binOffset: number;
  /** Power of the line above the local noise floor (running median), in dB. */
  prominenceDb: number;
}

export interface PeakInterpolation {
  frequencyHz: number;
  amplitude: number;
  rmsAmplitude: number;
  binOffset: number;
}

/**
 * Interpolated frequency and amplitude of a tone whose highest bin is `bin`, window-aware:
 * the ratio r of the larger neighbour to the peak bin is matched to the window's own kernel,
 * |W(1 - d)| / |W(d)| = r, and the amplitude corrected by 1/|W(d)|. For the rectangular window this
 * is the ratio method of D. C. Rife & G. A. Vincent, Bell Syst. Tech. J. 49(2):197-228, 1970; for Hann,
 * T. Grandke, "Interpolation algorithms for discrete Fourier transforms of weighted signals",
 * IEEE Trans. Instrum. Meas. 32(2):350-355, 1983 (closed form d = (2r - 1)/(r + 1)); here the kernel is
 * inverted numerically so every window (and finite N) is handled alike (citations from memory).
 * Exact for one tone in no noise, apart from the negative-frequency image of tones a few bins from DC.
 * Because Welch averaging keeps each segment's |X|^2 shape, the method applies to averaged spectra too.
 */
export function interpolatePeak(spectrum: Spectrum, bin: number): PeakInterpolation {
  const n = spectrum.values.length;
  if (!(Number.isInteger(bin) && bin >= 0 && bin < n)) {
    throw spectraError('invalid_bin', `bin (${bin}) must be an integer index 0..${n - 1}`);
  }
  const p = binPower(spectrum, bin);
  let offset = 0;
  if (bin > 0 && bin < n - 1 && p > 0) {
    const left = binPower(spectrum, bin - 1);
    const right = binPower(spectrum, bin + 1);
    const side = right >= left ? 1 : -1;
    // neighbour/peak magnitude ratio; magnitude ~ sqrt(power). DC and Nyquist bins are not doubled,
    // so a neighbour at bin 0 reads half its paired power: undo that before taking the ratio.
    const neighbourPower = side === 1 ? right : left;
    const neighbourBin = bin + side;
    const pairing = (k: number) => (isEdge(spectrum, k) ? 2 : 1);
    const r = Math.sqrt((neighbourPower * pairing(neighbourBin)) / (p * pairing(bin)));
    offset = side * offsetFromRatio(spectrum.window, spectrum.segmentLength, r);
  }
  const gain = windowAmplitudeResponse(spectrum.window, offset, spectrum.segmentLength);
  const corrected = p / (gain * gain);
  return {
    frequencyHz: (bin + offset) * spectrum.frequencyResolutionHz,
    amplitude: valueFromPower(spectrum, bin, corrected),
    rmsAmplitude: Math.sqrt(corrected),
    binOffset: offset,
  };
}

function isEdge(spectrum: Spectrum, k: number): boolean {
  return k === 0 || (spectrum.segmentLength % 2 === 0 && k === spectrum.segmentLength / 2);
}

/**
 * Solves |W(1 - d)| / |W(d)| = r for d in [0, 0.5] by bisection (the ratio rises with d), 52 halvings.
 * Each step asks only which side of the root its midpoint lies on. A root estimate (regula falsi), checked by
 * evaluating the ratio on both sides of it, answers that for every midpoint farther than ROOT_MARGIN from it;
 * only the steps closer than that evaluate the ratio, so the result is the plain bisection's, bit for bit
 * (the ratio rises by at least 0.03 per bin for every window here, so the answer is safe by some 1e-12 in the ratio).
 */
function offsetFromRatio(window: WindowName, length: number, r: number): number {
  const g = (d: number) => windowAmplitudeResponse(window, 1 - d, length) / windowAmplitudeResponse(window, d, length);
  const g0 = g(0);
  if (!(r > g0)) return 0;
  if (r >= 1) return 0.5;
  const root = rootEstimate(g, r, g0);
  const known = root !== null && g(root - ROOT_MARGIN / 2) < r && !(g(root + ROOT_MARGIN / 2) < r);
  let lo = 0;
  let hi = 0.5;
  for (let i = 0; i < 52; i++) {
    const mid = 0.5 * (lo + hi);
    const below = known && mid < root! - ROOT_MARGIN ? true : known && mid > root! + ROOT_MARGIN ? false : g(mid) < r;
    if (below) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Distance from the root estimate beyond which the side of a bisection midpoint is taken as known. */
const ROOT_MARGIN = 1e-10;

/** Regula falsi (Illinois variant) for g(d) = r on [0, 0.5], g(0) = g0 < r < 1 = g(0.5); null if it does not settle. */
function rootEstimate(g: (d: number) => number, r: number, g0: number): number | null {
  let a = 0;
  let fa = g0 - r;
  let b = 0.5;
  let fb = 1 - r;
  let side = 0;
  for (let i = 0; i < 40; i++) {
    const c = (a * fb - b * fa) / (fb - fa);
    if (!(c > a && c < b)) return b - a < ROOT_MARGIN / 8 ? 0.5 * (a + b) : null;
    const fc = g(c) - r;
    if (fc === 0) return c;
    if (fc < 0) {
      a = c;
      fa = fc;
      if (side === -1) fb *= 0.5;
      side = -1;
    } else {
      b = c;
      fb = fc;
      if (side === 1) fa *= 0.5;
      side = 1;
    }
    // Converged when the step is far below the margin (the estimate needs only to be within it).
    if (Math.abs(fc) < 1e-14) return c;
  }
  return null;
}

export interface PeakOptions {
  /** Most peaks returned, strongest first; default 10. */
  count?: number;
  /** Only peaks whose highest bin lies in this band. */
  bandHz?: BandHz;
  /** Minimum power above the local noise floor, dB; default 6. */
  minProminenceDb?: number;
  /** Width of the running-median noise floor in bins (odd); default 63. */
  noiseFloorWidthBins?: number;
  /**
   * Lines more than this far (power dB) below the strongest bin are ignored; default 140 dB, beyond the
   * range of a 24-bit recorder, so rounding residue of noiseless data never shows as peaks.
   */
  dynamicRangeDb?: number;
  /** Interpolate frequency and amplitude (default true); false reports the highest bin as read. */
  interpolate?: boolean;
}

/**
 * Local maxima of a spectrum that stand at least minProminenceDb above the running-median noise
 * floor and within dynamicRangeDb of the strongest line, each interpolated with interpolatePeak, strongest (by tone power) first.
 */
export function findPeaks(spectrum: Spectrum, options: PeakOptions = {}): SpectralPeak[] {
  const count = options.count ?? 10;
  if (!(Number.isInteger(count) && count >= 0)) {
    throw spectraError('invalid_count', `count (${count}) must be an integer >= 0`);
  }
  const minProminenceDb = options.minProminenceDb ?? 6;
  if (!Number.isFinite(minProminenceDb)) {
    throw spectraError('invalid_prominence', `minProminenceDb (${minProminenceDb}) must be a finite number`);
  }
  const dynamicRangeDb = options.dynamicRangeDb ?? 140;
  if (!(dynamicRangeDb > 0)) {
    throw spectraError('invalid_prominence', `dynamicRangeDb (${dynamicRangeDb}) must be a number of dB > 0`);
  }
  const floorValues = noiseFloor(spectrum, options.noiseFloorWidthBins ?? DEFAULT_NOISE_FLOOR_WIDTH_BINS);
  const f = spectrum.frequenciesHz;
  let lo = 1;
  let hi = f.length - 2;
  if (options.bandHz) {
    assertBand(options.bandHz);
    while (lo <= hi && f[lo] < options.bandHz[0]) lo++;
    while (hi >= lo && f[hi] > options.bandHz[1]) hi--;
  }
  const v = spectrum.values;
  let strongest = 0;
  for (let k = 1; k < v.length; k++) strongest = Math.max(strongest, binPower(spectrum, k));
  const weakest = strongest * 10 ** (-dynamicRangeDb / 10);
  const candidates: SpectralPeak[] = [];
  for (let k = lo; k <= hi; k++) {
    if (!(v[k] > v[k - 1] && v[k] >= v[k + 1])) continue;
    const floorPower = binPower({ ...spectrum, values: floorValues }, k);
    const power = binPower(spectrum, k);
    if (power < weakest) continue;
    const prominenceDb = floorPower > 0 ? 10 * Math.log10(power / floorPower) : Infinity;
    if (prominenceDb < minProminenceDb) continue;
    const peak =
      options.interpolate === false
        ? { frequencyHz: f[k], amplitude: v[k], rmsAmplitude: Math.sqrt(power), binOffset: 0 }
        : interpolatePeak(spectrum, k);
    candidates.push({ ...peak, bin: k, prominenceDb });
  }
  candidates.sort((a, b) => b.rmsAmplitude - a.rmsAmplitude);
  return candidates.slice(0, count);
}
