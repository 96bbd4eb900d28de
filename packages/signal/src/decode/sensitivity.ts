import { checkChannelUnit, UNSTATED_UNIT } from '../units/channel-units.js';
import { decodeError } from './decode-error.js';

/**
 * How digital values become engineering units. Digital full scale is ±1 after PCM normalisation
 * (a signed count divided by 2^(bits-1)); float data is taken as already normalised to ±1.
 *
 * - `mvPerUnit` with `fullScaleVolts`: a transducer sensitivity (e.g. 100 mV/g) behind a digitiser whose
 *   full scale is `fullScaleVolts` volts: value = x · fullScaleVolts · 1000 / mvPerUnit.
 * - `countsPerUnit`: value = counts / countsPerUnit, counts being the integer at the valid bit depth
 *   (for float data, the stored value itself).
 * - `fullScaleUnits`: the logger's range, e.g. 50 for a ±50 g input: value = x · fullScaleUnits.
 */
export type Sensitivity =
  | { mvPerUnit: number; fullScaleVolts?: number; unit: string }
  | { countsPerUnit: number; unit: string }
  | { fullScaleUnits: number; unit: string };

/** What a channel's raw values are, for turning a sensitivity into one multiplier. */
export interface DigitalScale {
  /** True for IEEE float data, false for PCM. */
  float: boolean;
  /** Valid bits per PCM sample (counts = x · 2^(validBits-1)). */
  validBits: number;
}

export interface ChannelScale {
  /** Multiplier from the normalised value (PCM) or the stored value (float) to `unit`. */
  factor: number;
  unit: string;
}

function positive(value: unknown, name: string, channel: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw decodeError(
      'sensitivity_invalid',
      `sensitivity.${name} for channel ${channel + 1} (${String(value)}) must be a positive number.`,
    );
  }
  return value;
}

/**
 * Resolves the `sensitivity` option (one for all channels or one per channel) into a multiplier and
 * unit per channel. Without one, PCM stays in full-scale units ('FS') and float data takes `unit`.
 */
export function channelScales(
  sensitivity: Sensitivity | readonly Sensitivity[] | undefined,
  channelCount: number,
  digital: DigitalScale,
  options: { fullScaleVolts?: number; unit?: string },
): ChannelScale[] {
  if (sensitivity === undefined) {
    const unit = digital.float ? (options.unit ?? UNSTATED_UNIT) : 'FS';
    return Array.from({ length: channelCount }, () => ({ factor: 1, unit }));
  }
  const list: readonly Sensitivity[] = Array.isArray(sensitivity)
    ? sensitivity
    : Array.from({ length: channelCount }, () => sensitivity as Sensitivity);
  if (list.length !== channelCount) {
    throw decodeError(
      'sensitivity_invalid',
      `sensitivity lists ${list.length} entries but the recording has ${channelCount} channel${channelCount === 1 ? '' : 's'}; give one for all or one per channel.`,
    );
  }
  return list.map((s, channel) => {
    if (s === null || typeof s !== 'object') {
      throw decodeError('sensitivity_invalid', `sensitivity for channel ${channel + 1} must be an object.`);
    }
    const given = (s as { unit?: unknown }).unit;
    if (typeof given !== 'string' || given.trim() === '') {
      throw decodeError('sensitivity_invalid', `sensitivity.unit for channel ${channel + 1} must name the unit, e.g. 'g'.`);
    }
    const unit = checkChannelUnit(given, `sensitivity.unit for channel ${channel + 1}`);
    if ('mvPerUnit' in s) {
      const mvPerUnit = positive(s.mvPerUnit, 'mvPerUnit', channel);
      const volts = s.fullScaleVolts ?? options.fullScaleVolts;
      if (volts === undefined) {
        throw decodeError(
          'sensitivity_invalid',
          `sensitivity.mvPerUnit for channel ${channel + 1} needs fullScaleVolts, the input voltage at digital full scale.`,
        );
      }
      return { factor: (positive(volts, 'fullScaleVolts', channel) * 1000) / mvPerUnit, unit };
    }
    if ('countsPerUnit' in s) {
      const countsPerUnit = positive(s.countsPerUnit, 'countsPerUnit', channel);
      const countsPerFullScale = digital.float ? 1 : 2 ** (digital.validBits - 1);
      return { factor: countsPerFullScale / countsPerUnit, unit };
    }
    if ('fullScaleUnits' in s) {
      return { factor: positive(s.fullScaleUnits, 'fullScaleUnits', channel), unit };
    }
    throw decodeError(
      'sensitivity_invalid',
      `sensitivity for channel ${channel + 1} must give mvPerUnit (with fullScaleVolts), countsPerUnit or fullScaleUnits.`,
    );
  });
}
