import { SignalInputError } from '../errors.js';
import { welchSpectrum, type DetrendMode, type Spectrum, type SpectrumScaling, type WindowName } from '../spectra/index.js';
import type { AngleDomainSignal } from './angle-resampling.js';

export interface OrderSpectrumOptions {
  /** Default 'peak' (a shaft-locked sinusoid of amplitude A at a bin-centred order reads A). */
  scaling?: SpectrumScaling;
  window?: WindowName;
  /** Whole revolutions per Welch segment; default all of them (one segment, order resolution 1/revolutions). */
  segmentRevolutions?: number;
  overlapFraction?: number;
  detrend?: DetrendMode;
  /** Unit of the samples; default ''. */
  unit?: string;
}

/** A one-sided spectrum against order (multiples of the reference shaft's speed). */
export interface OrderSpectrum {
  orders: Float64Array;
  values: Float64Array;
  scaling: SpectrumScaling;
  unit: string;
  /** Unit of `values`: unit, unit^2, or unit^2/order for 'psd'. */
  valueUnit: string;
  orderResolution: number;
  segmentRevolutions: number;
  averages: number;
  samplesPerRev: number;
  /** The same spectrum in the frequency-domain type, with "Hz" read as orders (for peak and noise-floor tools). */
  spectrum: Spectrum;
}

/**
 * Order spectrum of an angle-domain signal: Welch's method on the angle samples, with the samples per
 * revolution in place of the sample rate, so the bin spacing is in orders and the scalings are exactly
 * those of the frequency spectra (psd becomes unit²/order).
 */
export function orderSpectrum(signal: Pick<AngleDomainSignal, 'samples' | 'samplesPerRev' | 'revolutions'>, options: OrderSpectrumOptions = {}): OrderSpectrum {
  const segmentRevolutions = options.segmentRevolutions ?? signal.revolutions;
  if (!(Number.isInteger(segmentRevolutions) && segmentRevolutions >= 1 && segmentRevolutions <= signal.revolutions)) {
    throw new SignalInputError('invalid_parameter', `segmentRevolutions (${segmentRevolutions}) must be a whole number from 1 to ${signal.revolutions}`);
  }
  const unit = options.unit ?? '';
  const spectrum = welchSpectrum(signal.samples, signal.samplesPerRev, {
    scaling: options.scaling ?? 'peak',
    window: options.window ?? 'hann',
    segmentLength: segmentRevolutions * signal.samplesPerRev,
    overlapFraction: options.overlapFraction ?? 0.5,
    detrend: options.detrend ?? 'mean',
    unit,
  });
  const valueUnit = spectrum.scaling === 'psd' ? spectrum.valueUnit.replace(/\/Hz$/, '/order') : spectrum.valueUnit;
  return {
    orders: spectrum.frequenciesHz,
    values: spectrum.values,
    scaling: spectrum.scaling,
    unit,
    valueUnit,
    orderResolution: spectrum.frequencyResolutionHz,
    segmentRevolutions,
    averages: spectrum.averages,
    samplesPerRev: signal.samplesPerRev,
    spectrum,
  };
}

/** The largest value within ± `halfWidthOrders` (default one bin) of `order`, with the order where it sits. */
export function valueAtOrder(spectrum: OrderSpectrum, order: number, halfWidthOrders?: number): { order: number; value: number } {
  const w = halfWidthOrders ?? spectrum.orderResolution;
  const lo = Math.max(0, Math.ceil((order - w) / spectrum.orderResolution - 1e-9));
  const hi = Math.min(spectrum.orders.length - 1, Math.floor((order + w) / spectrum.orderResolution + 1e-9));
  let best = { order: Number.NaN, value: 0 };
  for (let k = lo; k <= hi; k++) if (!(spectrum.values[k]! <= best.value)) best = { order: spectrum.orders[k]!, value: spectrum.values[k]! };
  return best;
}
