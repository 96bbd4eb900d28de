import { spectraError } from './spectra-error.js';
import type { DetrendMode } from './detrend.js';
import type { WindowName } from './window.js';

/**
 * How one-sided spectrum values are scaled (scipy.signal.welch conventions):
 * - 'psd':   power spectral density, unit^2/Hz (scipy scaling='density', 1/(fs sum w^2));
 * - 'power': power per bin, unit^2 (scipy scaling='spectrum', 1/(sum w)^2); a bin-centred sine of
 *            amplitude A reads A^2/2;
 * - 'rms':   sqrt of 'power': a bin-centred sine reads its RMS amplitude A/sqrt(2);
 * - 'peak':  sqrt(2) x 'rms' on paired bins: a bin-centred sine reads its peak amplitude A.
 *            DC and the unpaired Nyquist bin have no negative-frequency twin, so there peak = rms.
 */
export type SpectrumScaling = 'psd' | 'power' | 'rms' | 'peak';

export const SPECTRUM_SCALINGS: readonly SpectrumScaling[] = ['psd', 'power', 'rms', 'peak'];

/** 'linear': mean of the segment periodograms (Welch); 'peak-hold': their bin-wise maximum. */
export type AveragingMode = 'linear' | 'peak-hold';

export const AVERAGING_MODES: readonly AveragingMode[] = ['linear', 'peak-hold'];

/** A one-sided spectrum and everything needed to read it correctly. */
export interface Spectrum {
  /** Bin centres, k * fs / segmentLength, k = 0 .. floor(segmentLength/2). */
  frequenciesHz: Float64Array;
  values: Float64Array;
  scaling: SpectrumScaling;
  /** Unit of the analysed signal, e.g. 'g' or 'mm/s'. */
  unit: string;
  /** Unit of `values`: unit^2/Hz, unit^2 or unit. */
  valueUnit: string;
  window: WindowName;
  detrend: DetrendMode;
  averaging: AveragingMode;
  segmentLength: number;
  /** Actual overlap, overlapSamples / segmentLength. */
  overlapFraction: number;
  overlapSamples: number;
  /** Number of segments averaged. */
  averages: number;
  frequencyResolutionHz: number;
  /** Equivalent noise bandwidth of the window in bins, N sum(w^2)/(sum w)^2. */
  enbwBins: number;
  sampleRateHz: number;
}

export function assertScaling(scaling: string, parameter = 'scaling'): SpectrumScaling {
  if (!(SPECTRUM_SCALINGS as readonly string[]).includes(scaling)) {
    throw spectraError('unknown_scaling', `${parameter} '${scaling}' is not one of ${SPECTRUM_SCALINGS.join(', ')}`);
  }
  return scaling as SpectrumScaling;
}

export function assertAveraging(mode: string, parameter = 'averaging'): AveragingMode {
  if (!(AVERAGING_MODES as readonly string[]).includes(mode)) {
    throw spectraError('unknown_averaging', `${parameter} '${mode}' is not one of ${AVERAGING_MODES.join(', ')}`);
  }
  return mode as AveragingMode;
}

export function valueUnitOf(unit: string, scaling: SpectrumScaling): string {
  const u = unit === '' ? '1' : unit;
  const squared = /[/*^ ]/.test(u) ? `(${u})^2` : `${u}^2`;
  if (scaling === 'psd') return `${squared}/Hz`;
  if (scaling === 'power') return squared;
  return u;
}

/** True for the bins with no negative-frequency twin: DC, and Nyquist when the segment length is even. */
export function isUnpairedBin(spectrum: Pick<Spectrum, 'segmentLength'>, k: number): boolean {
  return k === 0 || (spectrum.segmentLength % 2 === 0 && k === spectrum.segmentLength / 2);
}

/**
 * The bin's value expressed as 'power' scaling (unit^2 per bin, scipy scaling='spectrum').
 * psd -> power multiplies by ENBW in Hz = enbwBins * fs / N (scipy welch docs, Notes: the ratio of the
 * two scalings is sum(w^2) fs / (sum w)^2).
 */
export function binPower(spectrum: Spectrum, k: number): number {
  const v = spectrum.values[k];
  switch (spectrum.scaling) {
    case 'psd':
      return v * spectrum.enbwBins * spectrum.frequencyResolutionHz;
    case 'power':
      return v;
    case 'rms':
      return v * v;
    case 'peak':
      return isUnpairedBin(spectrum, k) ? v * v : (v * v) / 2;
  }
}

/** Inverse of binPower: the value a bin of the given scaling shows for a power-per-bin p. */
export function valueFromPower(spectrum: Spectrum, k: number, p: number): number {
  switch (spectrum.scaling) {
    case 'psd':
      return p / (spectrum.enbwBins * spectrum.frequencyResolutionHz);
    case 'power':
      return p;
    case 'rms':
      return Math.sqrt(p);
    case 'peak':
      return isUnpairedBin(spectrum, k) ? Math.sqrt(p) : Math.sqrt(2 * p);
  }
}

/** The same spectrum in another scaling (linear averages and peak hold alike convert bin by bin). */
export function withScaling(spectrum: Spectrum, scaling: SpectrumScaling): Spectrum {
  assertScaling(scaling);
  if (scaling === spectrum.scaling) return spectrum;
  const target: Spectrum = { ...spectrum, scaling, valueUnit: valueUnitOf(spectrum.unit, scaling), values: new Float64Array(spectrum.values.length) };
  for (let k = 0; k < spectrum.values.length; k++) target.values[k] = valueFromPower(target, k, binPower(spectrum, k));
  return target;
}
