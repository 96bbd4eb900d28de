/** Options of a simulated tach or encoder channel. */
export interface PulseTrainOptions {
  pulsesPerRev: number;
  /** Fraction of each pulse period spent high: a keyway mark is short, an encoder is a 50 % square wave. */
  dutyFraction: number;
  /** High level in volts (low is 0 V). */
  highV: number;
  /** Linear rise and fall time of each edge, seconds; finite edges let a detector place a crossing between samples. */
  edgeTimeS: number;
}

/**
 * A pulse train from a shaft's angle: high while the angle lies in the first `dutyFraction` of each
 * pulse pitch, with linear edges `edgeTimeS` long. `shaftRevolutions` is the sensor shaft's angle in
 * revolutions and `shaftSpeedHz` its instantaneous speed (to turn an angle past an edge into a time).
 */
export function pulseTrain(shaftRevolutions: Float64Array, shaftSpeedHz: Float64Array, options: PulseTrainOptions): Float64Array {
  const { pulsesPerRev, dutyFraction, highV, edgeTimeS } = options;
  const out = new Float64Array(shaftRevolutions.length);
  for (let i = 0; i < out.length; i++) {
    const pulses = shaftRevolutions[i]! * pulsesPerRev;
    const x = pulses - Math.floor(pulses);
    const pulseRateHz = Math.max(shaftSpeedHz[i]! * pulsesPerRev, 1e-9);
    const level =
      x < dutyFraction
        ? Math.min(1, x / pulseRateHz / edgeTimeS)
        : Math.max(0, 1 - (x - dutyFraction) / pulseRateHz / edgeTimeS);
    out[i] = highV * level;
  }
  return out;
}
