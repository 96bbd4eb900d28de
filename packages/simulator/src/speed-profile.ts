import { SimulatorInputError } from './errors.js';

/**
 * Speed of the reference shaft over the record: a constant (rpm), a linear ramp [startRpm, endRpm]
 * from the first to the last sample, or any function of time in seconds returning rpm.
 */
export type SpeedProfile = number | readonly [number, number] | ((tS: number) => number);

export interface ShaftMotion {
  /** Revolutions of the reference shaft at each sample, 0 at the first sample. */
  revolutions: Float64Array;
  /** Instantaneous speed of the reference shaft at each sample, Hz. */
  speedHz: Float64Array;
}

/**
 * Integrates the speed profile to shaft angle, so that every component that follows the shaft keeps
 * its order when the speed varies.
 */
export function shaftMotion(profile: SpeedProfile, sampleRateHz: number, sampleCount: number): ShaftMotion {
  const revolutions = new Float64Array(sampleCount);
  const speedHz = new Float64Array(sampleCount);
  const dt = 1 / sampleRateHz;
  if (typeof profile === 'number') {
    checkRpm(profile, 'speedRpm');
    const f = profile / 60;
    for (let i = 0; i < sampleCount; i++) {
      speedHz[i] = f;
      revolutions[i] = f * i * dt;
    }
    return { revolutions, speedHz };
  }
  if (typeof profile !== 'function') {
    const [startRpm, endRpm] = profile;
    checkRpm(startRpm, 'speedProfile[0]');
    checkRpm(endRpm, 'speedProfile[1]');
    const f0 = startRpm / 60;
    const spanS = Math.max((sampleCount - 1) * dt, dt);
    const slopeHzPerS = (endRpm - startRpm) / 60 / spanS;
    // Exact integral of a linear speed law: θ(t)/2π = f0·t + ½·(df/dt)·t².
    for (let i = 0; i < sampleCount; i++) {
      const t = i * dt;
      speedHz[i] = f0 + slopeHzPerS * t;
      revolutions[i] = f0 * t + 0.5 * slopeHzPerS * t * t;
    }
    return { revolutions, speedHz };
  }
  const rpmAt = (t: number) => {
    const rpm = profile(t);
    checkRpm(rpm, `speedProfile(${t})`);
    return rpm / 60;
  };
  let previous = rpmAt(0);
  speedHz[0] = previous;
  for (let i = 1; i < sampleCount; i++) {
    const t = i * dt;
    const mid = rpmAt(t - dt / 2);
    const end = rpmAt(t);
    // Simpson's rule over each sample interval: exact for speed laws up to cubic in time.
    revolutions[i] = revolutions[i - 1] + (dt / 6) * (previous + 4 * mid + end);
    speedHz[i] = end;
    previous = end;
  }
  return { revolutions, speedHz };
}

function checkRpm(rpm: number, name: string): void {
  if (!Number.isFinite(rpm) || rpm < 0) {
    throw new SimulatorInputError('invalid_speed', `${name} (${rpm}) must be a finite speed >= 0 rpm`);
  }
}
