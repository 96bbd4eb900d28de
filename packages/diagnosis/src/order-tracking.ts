import {
  noiseFloor,
  orderSpectrum,
  resampleToAngle,
  shaftAngleFromPulses,
  type OrderSpectrum,
  type PulseSpeed,
  type ShaftAngle,
} from '@kinespec/signal';
import { matchableSpectrum, type MatchableSpectrum } from './line-matching.js';

export interface AngleSpectra {
  /** Order spectrum of the channel against the reference shaft ("Hz" of its Spectrum read as orders). */
  orders: OrderSpectrum;
  measured: MatchableSpectrum;
  /** The channel resampled to equal steps of the reference shaft's angle (its envelope analysis runs on this, in orders). */
  resampled: { samples: Float64Array; samplesPerRev: number };
  revolutions: number;
  /** Angle of the reference shaft at every sample (for synchronous averages of other shafts). */
  shaftAngle: ShaftAngle;
}

/**
 * Computed order tracking of a vibration channel against the reference shaft, from tach or encoder pulses
 * (@kinespec/signal: cubic-spline shaft angle, band-limited resampling to uniform angle, Welch order spectrum).
 * A line locked to a shaft stays at one order however the speed wanders, so matching works in orders with
 * no speed error at all.
 */
// K. R. Fyfe & E. D. S. Munck, "Analysis of computed order tracking", MSSP 11(2):187–205 (1997).
export function angleSpectra(
  samples: Float64Array,
  sampleRateHz: number,
  unit: string,
  pulses: PulseSpeed,
  options: { slowestOrder: number },
  lap: (stage: string) => void = () => {},
): AngleSpectra | null {
  const angle = shaftAngleFromPulses(pulses, samples.length, sampleRateHz);
  const resampled = resampleToAngle(samples, sampleRateHz, angle, { samplesPerRev: samplesPerRevFor(sampleRateHz, pulses), interpolation: 'sinc' });
  lap('angle: resampling');
  const segmentRevolutions = segmentRevolutionsFor(resampled.revolutions, options.slowestOrder);
  if (segmentRevolutions === null) return null;
  const orders = orderSpectrum(resampled, { scaling: 'peak', segmentRevolutions, unit });
  lap('angle: order spectrum');
  const measured = matchableSpectrum(orders.spectrum, noiseFloor(orders.spectrum));
  lap('angle: noise floor');
  return { orders, measured, resampled: { samples: resampled.samples, samplesPerRev: resampled.samplesPerRev }, revolutions: resampled.revolutions, shaftAngle: angle };
}

function powerOfTwoAtLeast(x: number): number {
  let p = 16;
  while (p < x) p *= 2;
  return p;
}

/** Samples per revolution: a power of two holding every order up to 0.4 × fs at the lowest speed of the record. */
function samplesPerRevFor(sampleRateHz: number, pulses: PulseSpeed): number {
  const maxOrder = (0.4 * sampleRateHz) / pulses.maxHz;
  return Math.min(8192, powerOfTwoAtLeast((2.56 * maxOrder * pulses.maxHz) / pulses.minHz));
}

/**
 * Revolutions per Welch segment: a power of two giving an order resolution of at most a quarter of the slowest
 * shaft's order, at most half the record (three averages with 50 % overlap); null when the record is too short.
 */
function segmentRevolutionsFor(revolutions: number, slowestOrder: number): number | null {
  if (revolutions < 4) return null;
  let largest = 1;
  while (largest * 2 <= revolutions) largest *= 2;
  const cap = largest >= 8 ? largest / 2 : largest;
  let n = 4;
  while (n < cap && 1 / n > slowestOrder / 4) n *= 2;
  return Math.min(n, cap);
}
