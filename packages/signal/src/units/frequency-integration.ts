import { unitError } from './unit-error.js';
import { complexSpectrumToReal, realToComplexSpectrum } from '../spectra/fft.js';
import { valueUnitOf, type Spectrum } from '../spectra/spectrum.js';
import { normalizeUnit, quantityOfUnit, siUnitOf, unitScaleFactor, type Quantity } from './unit-registry.js';

/**
 * Default low-frequency cutoff of integration: lines below it are zeroed, because dividing by
 * 2 pi f amplifies sensor drift and 1/f noise without bound. 2 Hz sits below the lowest band edge
 * ISO 20816-3 uses (2-1000 Hz for machines at 120-600 r/min; 10-1000 Hz otherwise), so every ISO
 * band is untouched.
 */
export const DEFAULT_INTEGRATION_CUTOFF_HZ = 2;

export interface IntegrationOptions {
  /** Lines strictly below this frequency are set to zero; default 2 Hz. Must be > 0. */
  lowCutoffHz?: number;
}

const ORDER: Readonly<Record<Quantity, number>> = { acceleration: 0, velocity: 1, displacement: 2 };

function integrationSteps(from: string, to: string): number {
  const steps = ORDER[quantityOfUnit(to, 'to')] - ORDER[quantityOfUnit(from, 'from')];
  if (steps < 0) {
    throw unitError(
      'incompatible_units',
      `cannot derive '${to}' from '${from}': only integration (acceleration -> velocity -> displacement) is supported`,
    );
  }
  return steps;
}

function cutoffOf(options: IntegrationOptions): number {
  const cutoff = options.lowCutoffHz ?? DEFAULT_INTEGRATION_CUTOFF_HZ;
  if (!(Number.isFinite(cutoff) && cutoff > 0)) {
    throw unitError('invalid_cutoff', `lowCutoffHz (${cutoff}) must be a finite frequency > 0`);
  }
  return cutoff;
}

/**
 * Integrates a time record in the frequency domain: X(f) / (j 2 pi f)^steps on the DFT of the whole
 * record, lines below the cutoff zeroed, inverse DFT (common practice: integration divides each
 * Fourier component by j omega).
 * The DFT treats the record as periodic, so a record that does not hold whole cycles shows end effects.
 * Returns samples in `toUnit`; same-quantity requests only rescale.
 */
export function integrateSignal(
  samples: Float64Array,
  sampleRateHz: number,
  fromUnit: string,
  toUnit: string,
  options: IntegrationOptions = {},
): Float64Array {
  const steps = integrationSteps(fromUnit, toUnit);
  if (!(Number.isFinite(sampleRateHz) && sampleRateHz > 0)) {
    throw unitError('sample_rate_invalid', `sampleRateHz (${sampleRateHz}) must be a finite number > 0`);
  }
  const cutoff = cutoffOf(options);
  if (steps === 0) {
    const f = unitScaleFactor(fromUnit, toUnit);
    return samples.map((v) => v * f);
  }
  const n = samples.length;
  if (n === 0) return new Float64Array(0);
  const X = realToComplexSpectrum(samples);
  const toSi = unitScaleFactor(fromUnit, siUnitOf(quantityOfUnit(fromUnit)));
  const fromSi = unitScaleFactor(siUnitOf(quantityOfUnit(toUnit)), toUnit);
  const scale = toSi * fromSi;
  const half = Math.floor(n / 2);
  for (let k = 0; k <= half; k++) {
    const f = (k * sampleRateHz) / n;
    let re = X[2 * k];
    let im = X[2 * k + 1];
    // an even-length record's Nyquist line is real; 1/(j w) would make it imaginary, which no real signal has
    const nyquistOdd = n % 2 === 0 && k === half && steps % 2 === 1;
    if (f < cutoff || nyquistOdd) {
      re = 0;
      im = 0;
    } else {
      const w = 2 * Math.PI * f;
      for (let s = 0; s < steps; s++) {
        // (re + j im) / (j w) = (im - j re) / w
        const r = im / w;
        im = -re / w;
        re = r;
      }
      re *= scale;
      im *= scale;
    }
    X[2 * k] = re;
    X[2 * k + 1] = im;
    if (k > 0 && k < n - k) {
      X[2 * (n - k)] = re;
      X[2 * (n - k) + 1] = -im;
    }
  }
  return complexSpectrumToReal(X);
}

/**
 * Integrates a one-sided spectrum line by line: amplitude scalings (peak, rms) divide by 2 pi f,
 * power scalings (psd, power) by (2 pi f)^2, once per integration step; lines below the cutoff
 * become zero. For a sine, v = a / (2 pi f) (common practice).
 */
export function integrateSpectrum(spectrum: Spectrum, toUnit: string, options: IntegrationOptions = {}): Spectrum {
  const steps = integrationSteps(spectrum.unit, toUnit);
  const cutoff = cutoffOf(options);
  const to = normalizeUnit(toUnit, 'toUnit');
  const toSi = unitScaleFactor(spectrum.unit, siUnitOf(quantityOfUnit(spectrum.unit)));
  const fromSi = unitScaleFactor(siUnitOf(quantityOfUnit(to)), to);
  const amplitudeScale = toSi * fromSi;
  const squared = spectrum.scaling === 'psd' || spectrum.scaling === 'power';
  const values = new Float64Array(spectrum.values.length);
  for (let k = 0; k < values.length; k++) {
    const f = spectrum.frequenciesHz[k];
    if (steps > 0 && f < cutoff) continue;
    const gain = amplitudeScale / (steps > 0 ? (2 * Math.PI * f) ** steps : 1);
    values[k] = spectrum.values[k] * (squared ? gain * gain : gain);
  }
  return { ...spectrum, values, unit: to, valueUnit: valueUnitOf(to, spectrum.scaling) };
}

