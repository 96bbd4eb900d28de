import { SignalInputError } from '../errors.js';

/** Checks shared by the angle-domain functions; each message names the parameter. */
export function assertSampleRate(sampleRateHz: number, parameter = 'sampleRateHz'): void {
  if (!(Number.isFinite(sampleRateHz) && sampleRateHz > 0)) {
    throw new SignalInputError('invalid_sample_rate', `${parameter} (${sampleRateHz}) must be a finite number > 0`);
  }
}

export function assertFiniteSamples(samples: Float64Array, parameter = 'samples'): void {
  if (!(samples instanceof Float64Array)) throw new SignalInputError('invalid_samples', `${parameter} must be a Float64Array`);
  for (let i = 0; i < samples.length; i++) {
    if (!Number.isFinite(samples[i])) {
      throw new SignalInputError('non_finite_sample', `${parameter}[${i}] is ${samples[i]}; every sample must be a finite number`, `${parameter}[${i}]`);
    }
  }
}

export function assertWholeNumber(value: number, parameter: string, min = 1): void {
  if (!(Number.isInteger(value) && value >= min)) {
    throw new SignalInputError('invalid_parameter', `${parameter} (${value}) must be a whole number >= ${min}`);
  }
}

export function assertPositive(value: number, parameter: string): void {
  if (!(Number.isFinite(value) && value > 0)) {
    throw new SignalInputError('invalid_parameter', `${parameter} (${value}) must be a finite number > 0`);
  }
}
