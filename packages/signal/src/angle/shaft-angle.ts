import { SignalInputError } from '../errors.js';
import { assertPositive, assertSampleRate } from './angle-input.js';
import { cubicSpline, evaluateSpline } from './cubic-spline.js';
import type { PulseSpeed } from './pulse-speed.js';

export interface ShaftAngle {
  /** Angle of the wanted shaft in revolutions at each sample (0 at the first pulse); NaN before the first and after the last pulse. */
  revolutions: Float64Array;
  /** Its instantaneous speed from the spline's slope, Hz (NaN where the angle is). */
  speedHz: Float64Array;
  /** First and last sample with a defined angle. */
  firstSample: number;
  lastSample: number;
}

/**
 * Angle of the shaft at every sample of the recording, from the pulses: a cubic spline through
 * (pulse time, pulse angle), exact for a shaft under constant acceleration; higher-order interpolation
 * of the pulse times is what Fyfe & Munck (1997) found most improves computed order tracking. The angle
 * is scaled by the ratio carried in `pulses`, so it is the wanted shaft's.
 */
// K. R. Fyfe & E. D. S. Munck, "Analysis of computed order tracking", MSSP 11(2):187-205 (1997).
export function shaftAngleFromPulses(pulses: PulseSpeed, sampleCount: number, sampleRateHz: number): ShaftAngle {
  assertSampleRate(sampleRateHz);
  if (!(Number.isInteger(sampleCount) && sampleCount >= 2)) throw new SignalInputError('invalid_parameter', `sampleCount (${sampleCount}) must be a whole number >= 2`);
  const scale = pulses.ratio / pulses.pulsesPerRev;
  const y = pulses.pulseIndex.map((k) => k * scale);
  const spline = cubicSpline(pulses.pulseTimesS, y);
  const at = new Float64Array(sampleCount);
  for (let i = 0; i < sampleCount; i++) at[i] = i / sampleRateHz;
  const { values, slopes } = evaluateSpline(spline, at, true);
  let first = -1;
  let last = -1;
  for (let i = 0; i < sampleCount; i++) {
    if (Number.isNaN(values[i]!)) continue;
    if (first < 0) first = i;
    last = i;
  }
  if (first < 0 || last - first < 2) throw new SignalInputError('too_few_pulses', 'the pulses span fewer than 3 samples of the recording');
  return { revolutions: values, speedHz: slopes!, firstSample: first, lastSample: last };
}

/** The same angle scaled to another shaft: `ratio` is that shaft's speed over this one's. */
export function scaleShaftAngle(angle: ShaftAngle, ratio: number): ShaftAngle {
  assertPositive(ratio, 'ratio');
  return {
    ...angle,
    revolutions: angle.revolutions.map((r) => r * ratio),
    speedHz: angle.speedHz.map((f) => f * ratio),
  };
}

/** The angle of a shaft turning at a known speed law (tests, simulations): revolutions(t) sampled at each sample. */
export function shaftAngleFromLaw(revolutionsAt: (tS: number) => number, sampleCount: number, sampleRateHz: number): ShaftAngle {
  assertSampleRate(sampleRateHz);
  const revolutions = new Float64Array(sampleCount);
  const speedHz = new Float64Array(sampleCount);
  for (let i = 0; i < sampleCount; i++) revolutions[i] = revolutionsAt(i / sampleRateHz);
  for (let i = 0; i < sampleCount; i++) {
    const a = Math.max(0, i - 1);
    const b = Math.min(sampleCount - 1, i + 1);
    speedHz[i] = ((revolutions[b]! - revolutions[a]!) * sampleRateHz) / (b - a);
  }
  return { revolutions, speedHz, firstSample: 0, lastSample: sampleCount - 1 };
}
