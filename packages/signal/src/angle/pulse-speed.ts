import { SignalInputError } from '../errors.js';
import { assertPositive, assertWholeNumber } from './angle-input.js';

export interface PulseSpeedOptions {
  /** Pulses per revolution of the shaft the pulses come from; default 1 (a once-per-rev tach). */
  pulsesPerRev?: number;
  /** Speed of the shaft wanted over the speed of the pulse shaft (a kinematic ratio); default 1. */
  ratio?: number;
  /** An interval this many times the local median interval or longer holds missing pulses; default 1.5. */
  missingFactor?: number;
  /** A pulse that comes less than this fraction of the local median interval after the last one is an extra; default 0.5. */
  extraFactor?: number;
  /** The instantaneous speed is the mean over this many pulse pitches; default pulsesPerRev (one revolution). */
  smoothingPulses?: number;
}

export interface PulseSpeed {
  pulsesPerRev: number;
  ratio: number;
  /** Accepted pulse times (extras removed), s. */
  pulseTimesS: Float64Array;
  /** Angle of each accepted pulse in pulse pitches from the first one (missing pulses leave gaps). */
  pulseIndex: Float64Array;
  /** Start time of each whole revolution of the pulse shaft after the first pulse (interpolated where its pulse is missing). */
  revolutionTimesS: Float64Array;
  /** Speeds of the wanted shaft (pulse shaft × ratio), Hz. */
  meanSpeedHz: number;
  minHz: number;
  maxHz: number;
  /** maxHz − minHz of the smoothed instantaneous speed. */
  spreadHz: number;
  missingPulses: number;
  extraPulses: number;
  /** Times near which pulses were missing (the interval's start) or extra (the dropped pulse). */
  missingAtS: number[];
  extraAtS: number[];
  /** Smoothed instantaneous speed of the wanted shaft at the centre of each smoothing span. */
  instantaneous: { timesS: Float64Array; speedHz: Float64Array; smoothing: string };
}

/**
 * Running speed from pulse times: extra pulses (too close to the previous one) are dropped, gaps of
 * about k pulse pitches are read as k − 1 missing pulses, each pulse gets its angle in pitches, and
 * the speed is the angle travelled over the time taken, over the whole record (mean) and over spans of
 * `smoothingPulses` pitches (instantaneous). The local pitch is the median of the nine neighbouring
 * intervals, so the checks follow a run-up.
 */
export function speedFromPulses(edgeTimesS: Float64Array, options: PulseSpeedOptions = {}): PulseSpeed {
  const ppr = options.pulsesPerRev ?? 1;
  assertWholeNumber(ppr, 'pulsesPerRev');
  const ratio = options.ratio ?? 1;
  assertPositive(ratio, 'ratio');
  const missingFactor = options.missingFactor ?? 1.5;
  const extraFactor = options.extraFactor ?? 0.5;
  assertPositive(missingFactor, 'missingFactor');
  assertPositive(extraFactor, 'extraFactor');
  if (!(extraFactor < 1 && missingFactor > 1)) {
    throw new SignalInputError('invalid_parameter', `extraFactor (${extraFactor}) must be < 1 and missingFactor (${missingFactor}) > 1`);
  }
  const n = edgeTimesS.length;
  if (n < 3) {
    throw new SignalInputError('too_few_pulses', `found ${n} pulse(s); a speed needs at least 3 (check the channel, its thresholds and the record length)`);
  }
  for (let i = 1; i < n; i++) {
    if (!(edgeTimesS[i]! > edgeTimesS[i - 1]!)) throw new SignalInputError('invalid_pulses', `edgeTimesS must increase (edge ${i} is not after edge ${i - 1})`);
  }
  const intervals = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) intervals[i] = edgeTimesS[i + 1]! - edgeTimesS[i]!;
  const localPitch = runningMedian(intervals, 4);

  const times: number[] = [edgeTimesS[0]!];
  const index: number[] = [0];
  const missingAtS: number[] = [];
  const extraAtS: number[] = [];
  let missing = 0;
  for (let i = 1; i < n; i++) {
    const pitch = localPitch[Math.min(i - 1, localPitch.length - 1)]!;
    const gap = edgeTimesS[i]! - times[times.length - 1]!;
    if (gap < extraFactor * pitch) {
      extraAtS.push(edgeTimesS[i]!);
      continue;
    }
    let step = 1;
    if (gap >= missingFactor * pitch) {
      step = Math.max(2, Math.round(gap / pitch));
      missing += step - 1;
      missingAtS.push(times[times.length - 1]!);
    }
    times.push(edgeTimesS[i]!);
    index.push(index[index.length - 1]! + step);
  }
  const pulseTimesS = Float64Array.from(times);
  const pulseIndex = Float64Array.from(index);
  const count = times.length;
  if (pulseIndex[count - 1]! < 2) throw new SignalInputError('too_few_pulses', 'fewer than 2 pulse pitches remain after removing extra pulses');

  const meanSpeedHz = (ratio * pulseIndex[count - 1]!) / ppr / (pulseTimesS[count - 1]! - pulseTimesS[0]!);

  const span = Math.max(1, Math.round(options.smoothingPulses ?? ppr));
  const instTimes: number[] = [];
  const instSpeed: number[] = [];
  // Pair each pulse with the first later pulse at least `span` pitches on: the mean speed over that angle.
  let j = 0;
  for (let i = 0; i < count; i++) {
    if (j <= i) j = i + 1;
    while (j < count && pulseIndex[j]! - pulseIndex[i]! < span) j++;
    if (j >= count) break;
    const dt = pulseTimesS[j]! - pulseTimesS[i]!;
    instTimes.push((pulseTimesS[i]! + pulseTimesS[j]!) / 2);
    instSpeed.push((ratio * (pulseIndex[j]! - pulseIndex[i]!)) / ppr / dt);
  }
  if (instSpeed.length === 0) {
    // Record shorter than one smoothing span: the mean speed is the only estimate.
    instTimes.push((pulseTimesS[0]! + pulseTimesS[count - 1]!) / 2);
    instSpeed.push(meanSpeedHz);
  }
  let minHz = Infinity;
  let maxHz = -Infinity;
  for (const v of instSpeed) {
    if (v < minHz) minHz = v;
    if (v > maxHz) maxHz = v;
  }

  const revolutionTimes: number[] = [];
  for (let k = 0, p = 0; k * ppr <= pulseIndex[count - 1]!; k++) {
    const target = k * ppr;
    while (p < count - 1 && pulseIndex[p + 1]! <= target) p++;
    if (pulseIndex[p] === target) revolutionTimes.push(pulseTimesS[p]!);
    else if (p < count - 1) {
      const f = (target - pulseIndex[p]!) / (pulseIndex[p + 1]! - pulseIndex[p]!);
      revolutionTimes.push(pulseTimesS[p]! + f * (pulseTimesS[p + 1]! - pulseTimesS[p]!));
    }
  }
  return {
    pulsesPerRev: ppr,
    ratio,
    pulseTimesS,
    pulseIndex,
    revolutionTimesS: Float64Array.from(revolutionTimes),
    meanSpeedHz,
    minHz,
    maxHz,
    spreadHz: maxHz - minHz,
    missingPulses: missing,
    extraPulses: extraAtS.length,
    missingAtS,
    extraAtS,
    instantaneous: {
      timesS: Float64Array.from(instTimes),
      speedHz: Float64Array.from(instSpeed),
      smoothing: `mean speed over ${span} pulse pitch${span === 1 ? '' : 'es'} (${(span / ppr).toPrecision(3)} rev of the pulse shaft), centred`,
    },
  };
}

/** Median of each value's neighbourhood of `halfWidth` on each side (fewer at the ends). */
function runningMedian(x: Float64Array, halfWidth: number): Float64Array {
  const out = new Float64Array(x.length);
  const window: number[] = [];
  for (let i = 0; i < x.length; i++) {
    window.length = 0;
    for (let k = Math.max(0, i - halfWidth); k <= Math.min(x.length - 1, i + halfWidth); k++) window.push(x[k]!);
    window.sort((a, b) => a - b);
    const mid = window.length >> 1;
    out[i] = window.length % 2 === 1 ? window[mid]! : (window[mid - 1]! + window[mid]!) / 2;
  }
  return out;
}
