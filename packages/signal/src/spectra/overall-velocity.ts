import { spectraError } from './spectra-error.js';
import { integrateSpectrum } from '../units/frequency-integration.js';
import { unitError } from '../units/unit-error.js';
import { convertUnit, quantityOfUnit } from '../units/unit-registry.js';
import { assertBand, bandRms, type BandHz } from './band-rms.js';
import { welchSpectrum, type WelchOptions } from './welch.js';

/** A broadband level: the RMS of the signal within a band. */
export interface OverallLevel {
  rms: number;
  unit: string;
  /** The band actually used (the upper edge is clipped to the Nyquist frequency). */
  bandHz: [number, number];
}

export interface OverallVelocity extends OverallLevel {
  unit: 'mm/s';
  velocityRmsMmPerS: number;
}

export interface OverallVelocityOptions extends Omit<WelchOptions, 'scaling' | 'unit' | 'averaging'> {
  /** Default [10, 1000] Hz, the broadband range of ISO 20816-3 (ISO 10816-3) for machines above 600 r/min. */
  bandHz?: BandHz;
  /** Integration cutoff for acceleration input; default DEFAULT_INTEGRATION_CUTOFF_HZ (2 Hz). */
  lowCutoffHz?: number;
}

/** ISO 20816-3 broadband velocity range, 10-1000 Hz (2-1000 Hz for machines at 120-600 r/min). */
export const ISO_VELOCITY_BAND_HZ: BandHz = [10, 1000];

/** Clips a band's upper edge to the Nyquist frequency; throws when nothing is left. */
export function clipBandToNyquist(bandHz: BandHz, sampleRateHz: number, parameter = 'bandHz'): [number, number] {
  assertBand(bandHz, parameter);
  const nyquist = sampleRateHz / 2;
  const hi = Math.min(bandHz[1], nyquist);
  if (!(hi > bandHz[0])) {
    throw spectraError(
      'band_above_nyquist',
      `${parameter} [${bandHz[0]}, ${bandHz[1]}] lies above the Nyquist frequency ${nyquist} Hz of this recording`,
    );
  }
  return [bandHz[0], hi];
}

/**
 * Overall RMS velocity in a band (mm/s) from an acceleration or velocity record: the Welch PSD
 * (Hann, mean removed) is integrated line by line, P_v(f) = P_a(f) / (2 pi f)^2 (v = a / (2 pi f),
 * common practice), and summed over the band (bandRms). Displacement input is refused.
 */
export function overallVelocityRms(
  samples: Float64Array,
  sampleRateHz: number,
  unit: string,
  options: OverallVelocityOptions = {},
): OverallVelocity {
  const quantity = quantityOfUnit(unit);
  if (quantity === 'displacement') {
    throw unitError('incompatible_units', `cannot derive velocity from a displacement channel ('${unit}')`);
  }
  const { bandHz = ISO_VELOCITY_BAND_HZ, lowCutoffHz, ...welch } = options;
  const band = clipBandToNyquist(bandHz, sampleRateHz);
  const psd = welchSpectrum(samples, sampleRateHz, { ...welch, scaling: 'psd', unit });
  const toMmPerS2 = quantity === 'velocity' ? convertUnit(1, unit, 'mm/s') ** 2 : 1;
  const velocity =
    quantity === 'acceleration'
      ? integrateSpectrum(psd, 'mm/s', lowCutoffHz === undefined ? {} : { lowCutoffHz })
      : { ...psd, values: psd.values.map((v) => v * toMmPerS2), unit: 'mm/s' };
  const rms = bandRms(velocity, band);
  return { rms, unit: 'mm/s', bandHz: band, velocityRmsMmPerS: rms };
}
