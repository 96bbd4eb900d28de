import { SignalInputError } from '../errors.js';
import { resampleToAngle, type AngleDomainSignal, type AngleResamplingOptions } from './angle-resampling.js';
import { scaleShaftAngle, type ShaftAngle } from './shaft-angle.js';

export interface SynchronousAverage {
  /** One revolution of the averaged shaft, `samplesPerRev` samples, starting at its angle 0. */
  average: Float64Array;
  samplesPerRev: number;
  /** Number of revolutions averaged (N). */
  averages: number;
  /** Expected amplitude factor on non-synchronous random noise, 1/√N. */
  noiseReductionFactor: number;
  /** Expected signal-to-noise gain on random noise, 10·log10(N) dB. */
  snrGainDb: number;
}

/**
 * Time-synchronous average: the mean of N whole revolutions of an angle-domain signal. Components
 * locked to the shaft keep their amplitude; uncorrelated noise falls by 1/√N in amplitude, and a
 * non-synchronous component at f·T revolutions per cycle passes with |sin(NπfT)/(N·sin(πfT))|.
 */
// S. Braun (1975), "The extraction of periodic waveforms by time domain averaging", Acustica 32:69-77; P. D. McFadden (1987), "A revised model for the extraction of periodic waveforms by time domain averaging", MSSP 1:83-95 (both from memory).
export function timeSynchronousAverage(signal: Pick<AngleDomainSignal, 'samples' | 'samplesPerRev'>, options: { revolutions?: number } = {}): SynchronousAverage {
  const { samples, samplesPerRev } = signal;
  const fits = Math.floor(samples.length / samplesPerRev);
  const n = options.revolutions ?? fits;
  if (!(Number.isInteger(n) && n >= 1 && n <= fits)) {
    throw new SignalInputError('invalid_parameter', `revolutions (${n}) must be a whole number from 1 to ${fits}`);
  }
  const average = new Float64Array(samplesPerRev);
  for (let r = 0; r < n; r++) {
    const offset = r * samplesPerRev;
    for (let i = 0; i < samplesPerRev; i++) average[i] += samples[offset + i]!;
  }
  for (let i = 0; i < samplesPerRev; i++) average[i] /= n;
  return { average, samplesPerRev, averages: n, noiseReductionFactor: 1 / Math.sqrt(n), snrGainDb: 10 * Math.log10(n) };
}

/**
 * Synchronous average of another shaft of the machine: the vibration channel is resampled to that
 * shaft's angle (the measured shaft's angle × `ratio`, its speed over the measured shaft's) and averaged
 * over its whole revolutions.
 */
export function shaftSynchronousAverage(
  samples: Float64Array,
  sampleRateHz: number,
  angle: ShaftAngle,
  ratio: number,
  options: AngleResamplingOptions = {},
): SynchronousAverage & { angleSignal: AngleDomainSignal } {
  const angleSignal = resampleToAngle(samples, sampleRateHz, scaleShaftAngle(angle, ratio), options);
  return { ...timeSynchronousAverage(angleSignal), angleSignal };
}
