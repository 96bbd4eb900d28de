import { SignalInputError } from '../errors.js';
import { assertFiniteSamples, assertSampleRate } from './angle-input.js';

export interface PulseDetectionOptions {
  /** Level the signal must rise above to start a pulse; default 60 % of the way from the low level to the high level. */
  upperThreshold?: number;
  /** Level the signal must fall below to end it; default 40 % of the way. The gap between the two is the hysteresis. */
  lowerThreshold?: number;
  /** 'positive' pulses rise above the base line (default); 'negative' ones dip below it (a notch read by a proximity probe). */
  polarity?: 'positive' | 'negative';
  /** A rising edge closer than this to the last accepted one is ignored; default 3 samples. */
  debounceS?: number;
}

export interface DetectedPulses {
  /** Time of each accepted leading edge, s from the first sample, placed between samples where the signal crosses mid-level. */
  edgeTimesS: Float64Array;
  upperThreshold: number;
  lowerThreshold: number;
  /** Leading edges ignored because they came within `debounceS` of the previous one. */
  debouncedEdges: number;
  debounceS: number;
}

/**
 * Leading edges of a pulse train (tach or encoder) by a Schmitt trigger: a pulse starts when the
 * signal rises above the upper threshold and the next one cannot start before it has fallen below
 * the lower threshold, so noise on a slow edge gives one edge, not several. Thresholds come from the
 * signal's own range (0.1 % and 99.9 % quantiles, robust to a few spikes) unless given. Each edge is
 * timed where the signal crosses the mid-level between the thresholds, interpolated linearly between
 * the two samples around it.
 */
// Common practice: comparator with hysteresis (Schmitt trigger) and linear interpolation of the threshold crossing for sub-sample timing (Fyfe & Munck 1997 show order-tracking accuracy is set by pulse timing).
export function detectPulses(samples: Float64Array, sampleRateHz: number, options: PulseDetectionOptions = {}): DetectedPulses {
  assertSampleRate(sampleRateHz);
  assertFiniteSamples(samples);
  if (samples.length < 2) throw new SignalInputError('record_too_short', `the pulse channel has ${samples.length} sample(s); pulse detection needs at least 2`);
  const sign = (options.polarity ?? 'positive') === 'negative' ? -1 : 1;
  const x = sign === 1 ? samples : samples.map((v) => -v);
  let upper = options.upperThreshold === undefined ? undefined : sign * options.upperThreshold;
  let lower = options.lowerThreshold === undefined ? undefined : sign * options.lowerThreshold;
  if (sign === -1 && upper !== undefined && lower !== undefined) [upper, lower] = [Math.max(upper, lower), Math.min(upper, lower)];
  if (upper === undefined || lower === undefined) {
    const [low, high] = quantiles(x, 0.001, 0.999);
    if (!(high > low)) {
      throw new SignalInputError('no_pulses', 'the pulse channel is flat: no pulses can be found (check the channel number)');
    }
    upper ??= low + 0.6 * (high - low);
    lower ??= low + 0.4 * (high - low);
  }
  if (!(upper > lower)) {
    throw new SignalInputError('invalid_threshold', `upperThreshold (${sign * upper}) must lie beyond lowerThreshold (${sign * lower}) in the pulse direction`);
  }
  const debounceS = options.debounceS ?? 3 / sampleRateHz;
  if (!(debounceS >= 0)) throw new SignalInputError('invalid_debounce', `debounceS (${debounceS}) must be a number >= 0`);
  const mid = (upper + lower) / 2;
  const edges: number[] = [];
  let debounced = 0;
  let high = x[0]! >= upper;
  let last = -Infinity;
  for (let i = 1; i < x.length; i++) {
    if (!high && x[i]! >= upper) {
      high = true;
      // walk back to the mid-level crossing that belongs to this edge
      let j = i;
      while (j > 0 && x[j - 1]! >= mid) j--;
      const t = j === 0 ? 0 : (j - 1 + (mid - x[j - 1]!) / (x[j]! - x[j - 1]!)) / sampleRateHz;
      if (t - last < debounceS) {
        debounced++;
        continue;
      }
      edges.push(t);
      last = t;
    } else if (high && x[i]! <= lower) {
      high = false;
    }
  }
  return {
    edgeTimesS: Float64Array.from(edges),
    upperThreshold: sign * upper,
    lowerThreshold: sign * lower,
    debouncedEdges: debounced,
    debounceS,
  };
}

/**
 * Pulse times from a counter channel (the running pulse count sampled with the vibration): when the
 * count rises by m between two samples, m pulses are placed evenly inside that interval. A count that
 * goes down is treated as the counter wrapping at `wrapAt` (default 2^32) when given, else as an error.
 */
export function pulsesFromCounts(counts: Float64Array, sampleRateHz: number, options: { wrapAt?: number } = {}): Float64Array {
  assertSampleRate(sampleRateHz);
  assertFiniteSamples(counts, 'counts');
  const times: number[] = [];
  for (let i = 1; i < counts.length; i++) {
    let m = Math.round(counts[i]! - counts[i - 1]!);
    if (m < 0) {
      if (options.wrapAt === undefined) {
        throw new SignalInputError('count_decreased', `counts[${i}] (${counts[i]}) is below counts[${i - 1}] (${counts[i - 1]}); give wrapAt if the counter wraps`, `counts[${i}]`);
      }
      m += options.wrapAt;
    }
    for (let p = 1; p <= m; p++) times.push((i - 1 + p / (m + 1)) / sampleRateHz);
  }
  return Float64Array.from(times);
}

function quantiles(x: Float64Array, lowFraction: number, highFraction: number): [number, number] {
  const sorted = Float64Array.from(x).sort();
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(q * (sorted.length - 1))))]!;
  return [at(lowFraction), at(highFraction)];
}
