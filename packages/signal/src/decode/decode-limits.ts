import { decodeError } from './decode-error.js';

/**
 * Size limits every decoder checks from header fields or from the input length before it
 * allocates sample buffers, so an absurd header cannot exhaust memory.
 */
export interface DecodeLimits {
  /** Most samples accepted in one channel (default 2^27, about 87 min at 25.6 kHz). */
  maxSamplesPerChannel: number;
  /** Most channels accepted (default 64). */
  maxChannels: number;
  /** Most samples accepted over all channels together (default 2^28, 2 GiB of float64). */
  maxTotalSamples: number;
}

export const defaultDecodeLimits: Readonly<DecodeLimits> = Object.freeze({
  maxSamplesPerChannel: 2 ** 27,
  maxChannels: 64,
  maxTotalSamples: 2 ** 28,
});

export function resolveDecodeLimits(partial: Partial<DecodeLimits> | undefined): DecodeLimits {
  const limits = { ...defaultDecodeLimits, ...partial };
  for (const key of ['maxSamplesPerChannel', 'maxChannels', 'maxTotalSamples'] as const) {
    const value = limits[key];
    if (!Number.isSafeInteger(value) || value < 1) {
      throw decodeError('option_invalid', `limits.${key} (${String(value)}) must be a positive integer.`);
    }
  }
  return limits;
}

/** Throws `too_large` when a recording of this shape would pass the limits. */
export function checkRecordingSize(
  channelCount: number,
  samplesPerChannel: number,
  limits: DecodeLimits,
  where?: string,
): void {
  if (channelCount > limits.maxChannels) {
    throw decodeError(
      'too_large',
      `The recording has ${channelCount} channels; at most ${limits.maxChannels} are accepted (limits.maxChannels).`,
      where,
    );
  }
  if (samplesPerChannel > limits.maxSamplesPerChannel) {
    throw decodeError(
      'too_large',
      `The recording has ${samplesPerChannel} samples per channel; at most ${limits.maxSamplesPerChannel} are accepted (limits.maxSamplesPerChannel). Split the recording into shorter files.`,
      where,
    );
  }
  if (channelCount * samplesPerChannel > limits.maxTotalSamples) {
    throw decodeError(
      'too_large',
      `The recording has ${channelCount * samplesPerChannel} samples in all; at most ${limits.maxTotalSamples} are accepted (limits.maxTotalSamples). Split the recording into shorter files.`,
      where,
    );
  }
}
