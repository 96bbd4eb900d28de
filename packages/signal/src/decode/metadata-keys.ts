import { nearestName } from '../units/nearest-name.js';

/*
 * The metadata keys Kinespec reads or writes. A recording's other keys are kept as free metadata; a key that
 * is one slip away from one of these (`# unti=g`) is almost always a mistake that would silently change the
 * result, so the CSV decoder warns about it and names the key it probably meant.
 */

/** Keys a decoder reads, each with the spellings it accepts (compared lower-case without punctuation). */
export const decoderMetadataKeys = {
  sampleRateHz: ['sampleRateHz', 'sampleRate', 'fs', 'fsHz'],
  unit: ['unit', 'units'],
  channels: ['channels', 'channelNames', 'names'],
} as const satisfies Record<string, readonly string[]>;

/** When the recording was taken: the service files a recording under the first of these that parses. */
export const recordedAtMetadataKeys = ['recordedAt', 'recorded_at', 'startTime', 'start_time', 'timestamp'] as const;

/** Keys the analysis reads: which channel is a tach or encoder (0-based index, as the simulator writes it), its shaft and pulses. */
export const analysisMetadataKeys = ['tachChannel', 'tachShaft', 'tachPulsesPerRev', 'encoderChannel', 'encoderShaft', 'encoderPulsesPerRev'] as const;

/** Keys the simulator writes for people, which nothing reads: known (no warning), never suggested. */
export const informationalMetadataKeys = ['machineId', 'pointId', 'seed', 'faults', 'meanSpeedRpm', 'minSpeedRpm', 'maxSpeedRpm'] as const;

/** Every key Kinespec reads, in its usual spelling: the ones a near miss is pointed to. */
export const knownMetadataKeys: readonly string[] = Object.freeze([
  ...Object.values(decoderMetadataKeys).flat(),
  ...recordedAtMetadataKeys,
  ...analysisMetadataKeys,
]);

/** Lower case without punctuation: 'Sample_Rate' and 'sampleRate' are one key. */
export function foldKey(key: string): string {
  return key.toLowerCase().replace(/[^a-z0-9]/g, '');
}

const folded = new Set([...knownMetadataKeys, ...informationalMetadataKeys].map(foldKey));

export function isKnownMetadataKey(key: string): boolean {
  return folded.has(foldKey(key));
}

/** The known key an unknown one is probably a slip for ('unti' → 'unit'), or undefined. */
export function nearestMetadataKey(key: string): string | undefined {
  return isKnownMetadataKey(key) ? undefined : nearestName(key, knownMetadataKeys);
}

/** The recording time named by the first recordedAt-like key that parses as a date, or undefined. */
export function recordedAtFromMetadata(metadata: Readonly<Record<string, string>>): Date | undefined {
  for (const key of recordedAtMetadataKeys) {
    const text = metadata[key];
    if (text) {
      const at = new Date(text);
      if (!Number.isNaN(at.getTime())) return at;
    }
  }
  return undefined;
}
