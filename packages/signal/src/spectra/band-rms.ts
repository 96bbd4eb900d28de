import { spectraError } from './spectra-error.js';
import { binPower, type Spectrum } from './spectrum.js';

/** A frequency band [lowHz, highHz], both edges included. */
export type BandHz = readonly [number, number];

export function assertBand(bandHz: BandHz, parameter = 'bandHz'): void {
  const [lo, hi] = bandHz;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= 0 && hi > lo)) {
    throw spectraError('invalid_band', `${parameter} [${lo}, ${hi}] must be two finite frequencies with 0 <= low < high`);
  }
}

/**
 * RMS of the signal within a band, from a spectrum of any scaling: the sum of the bins' power
 * divided by the window's ENBW in bins, since a window of ENBW B bins lets B bins' worth of broadband
 * power into each line (Harris 1978; G. Heinzel, A. Ruediger, R. Schilling, "Spectrum and spectral
 * density estimation by the DFT...", AEI Hannover 2002: PS = PSD x ENBW). For PSD values this is sum(P df). Bins whose centre lies in
 * [low, high] count; default band: the whole spectrum.
 */
export function bandRms(spectrum: Spectrum, bandHz?: BandHz): number {
  const f = spectrum.frequenciesHz;
  let lo = 0;
  let hi = f.length - 1;
  if (bandHz) {
    assertBand(bandHz);
    const [low, high] = bandHz;
    // half a part in 1e9 of a bin absorbs rounding in k*fs/N at the edges
    const eps = spectrum.frequencyResolutionHz * 1e-9;
    lo = 0;
    while (lo < f.length && f[lo] < low - eps) lo++;
    hi = f.length - 1;
    while (hi >= 0 && f[hi] > high + eps) hi--;
    if (lo > hi) {
      throw spectraError(
        'empty_band',
        `bandHz [${low}, ${high}] holds no spectral line (lines every ${spectrum.frequencyResolutionHz} Hz up to ${f[f.length - 1]} Hz)`,
      );
    }
  }
  let sum = 0;
  for (let k = lo; k <= hi; k++) sum += binPower(spectrum, k);
  return Math.sqrt(sum / spectrum.enbwBins);
}
