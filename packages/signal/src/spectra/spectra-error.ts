import { SignalInputError } from '../errors.js';

/**
 * Every code the spectra area throws, with a title for a problem-type registry. Stable: the service
 * maps them to problem types, the CLI to exit code 2. `sample_rate_invalid` and `non_finite_sample`
 * mean the same as the decoders' codes of that name.
 */
export const spectraErrorDescriptions = {
  sample_rate_invalid: 'The sample rate is missing, zero, negative or not a finite number.',
  non_finite_sample: 'A sample is NaN or infinite.',
  invalid_samples: 'The samples are not given as a Float64Array.',
  record_too_short: 'The record has too few samples for a spectrum.',
  invalid_segment_length: 'The segment (window) length is not a whole number of samples >= 2.',
  segment_too_long: 'The segment length is longer than the record.',
  invalid_overlap: 'The segment overlap is not a fraction in [0, 1).',
  unknown_window: 'The window name is not one Kinespec offers.',
  unknown_detrend: 'The detrend mode is not mean, linear or none.',
  unknown_scaling: 'The spectrum scaling is not psd, power, rms or peak.',
  unknown_averaging: 'The averaging mode is not linear or peak-hold.',
  invalid_band: 'A frequency band is not two finite frequencies with 0 <= low < high.',
  empty_band: 'A frequency band holds no spectral line of the spectrum or record.',
  band_above_nyquist: 'A frequency band lies above the Nyquist frequency of the recording.',
  invalid_bin: 'A bin index is outside the spectrum.',
  invalid_count: 'A peak count is not a whole number >= 0.',
  invalid_prominence: 'A peak prominence or dynamic-range threshold is not a valid number of dB.',
  invalid_width: 'A running-median width is not an odd whole number of bins.',
  invalid_max_points: 'A plot point budget is not a whole number >= 2.',
} as const satisfies Record<string, string>;

export type SpectraErrorCode = keyof typeof spectraErrorDescriptions;

export function spectraError(code: SpectraErrorCode, message: string, where?: string): SignalInputError {
  return new SignalInputError(code, message, where);
}
