import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { detectPulses } from './pulse-detection.js';
import { speedFromPulses } from './pulse-speed.js';

/** Pulse times of a shaft accelerating uniformly from f0 (Hz) at a (Hz/s): roots of f0·t + a·t²/2 = k/P. */
function rampPulseTimes(f0: number, a: number, pulsesPerRev: number, durationS: number): number[] {
  const times: number[] = [];
  for (let k = 0; ; k++) {
    const r = k / pulsesPerRev;
    const t = a === 0 ? r / f0 : (-f0 + Math.sqrt(f0 * f0 + 2 * a * r)) / a;
    if (t > durationS) return times;
    times.push(t);
  }
}

/** A sampled 0/5 V square wave whose rising edges are at `times`, with linear edges two samples long. */
function squareWave(times: number[], sampleRateHz: number, count: number): Float64Array {
  const x = new Float64Array(count);
  const edge = 2 / sampleRateHz;
  for (let k = 0; k + 1 < times.length; k++) {
    const start = times[k]!;
    const width = (times[k + 1]! - start) / 2;
    for (let i = Math.floor(start * sampleRateHz); i <= Math.ceil((start + width + edge) * sampleRateHz) && i < count; i++) {
      const t = i / sampleRateHz - start;
      if (t < 0) continue;
      x[i] = 5 * (t < edge ? t / edge : t < width ? 1 : Math.max(0, 1 - (t - width) / edge));
    }
  }
  return x;
}

describe('speedFromPulses', () => {
  it('reads a constant speed exactly from a once-per-rev tach', () => {
    const times = Float64Array.from({ length: 21 }, (_, k) => 0.013 + k / 24.5);
    const s = speedFromPulses(times);
    expect(s.meanSpeedHz).toBeCloseTo(24.5, 9);
    expect(s.spreadHz).toBeLessThan(1e-9);
    expect(s.missingPulses).toBe(0);
    expect(s.extraPulses).toBe(0);
    expect(s.revolutionTimesS.length).toBe(21);
  });

  it('finds missing and extra pulses and keeps the speed and revolution times right', () => {
    const ppr = 8;
    const all = Array.from({ length: 8 * 30 + 1 }, (_, k) => k / (ppr * 12));
    const edited = all.filter((_, k) => k !== 50 && k !== 51 && k !== 120);
    edited.splice(200, 0, (all[203]! + all[204]!) / 2 - 1e-4); // a spurious pulse in the middle of a pitch
    edited.sort((a, b) => a - b);
    const s = speedFromPulses(Float64Array.from(edited), { pulsesPerRev: ppr });
    expect(s.missingPulses).toBe(3);
    expect(s.extraPulses).toBe(1);
    expect(s.meanSpeedHz).toBeCloseTo(12, 9);
    expect(s.minHz).toBeCloseTo(12, 6);
    expect(s.maxHz).toBeCloseTo(12, 6);
    expect(s.revolutionTimesS.length).toBe(31);
    s.revolutionTimesS.forEach((t, r) => expect(t).toBeCloseTo(r / 12, 9));
  });

  it('follows an encoder through a run-up to within 0.1 % of the known speed law', () => {
    // Uniform acceleration: the mean speed over a span equals the speed at the span's mid-time (θ quadratic in t).
    const fs = 51_200;
    const f0 = 8;
    const a = 6; // Hz/s
    const ppr = 64;
    const durationS = 3;
    const times = rampPulseTimes(f0, a, ppr, durationS);
    const x = squareWave(times, fs, Math.round(durationS * fs));
    const s = speedFromPulses(detectPulses(x, fs).edgeTimesS, { pulsesPerRev: ppr });
    expect(s.missingPulses + s.extraPulses).toBe(0);
    let worst = 0;
    s.instantaneous.timesS.forEach((t, k) => {
      worst = Math.max(worst, Math.abs(s.instantaneous.speedHz[k]! / (f0 + a * t) - 1));
    });
    expect(worst).toBeLessThan(0.001);
    expect(s.minHz).toBeGreaterThan(f0);
    expect(s.maxHz).toBeLessThan(f0 + a * durationS);
    expect(s.instantaneous.smoothing).toMatch(/64 pulse pitches/);
  });

  it('scales every speed by the ratio to another shaft', () => {
    const times = Float64Array.from({ length: 11 }, (_, k) => k / 10);
    expect(speedFromPulses(times, { ratio: 18 / 67 }).meanSpeedHz).toBeCloseTo((10 * 18) / 67, 9);
  });

  it('rejects too few pulses and a bad pulsesPerRev with typed errors', () => {
    expect(() => speedFromPulses(Float64Array.from([0, 1]))).toThrowError(SignalInputError);
    expect(() => speedFromPulses(Float64Array.from([0, 1, 2, 3]), { pulsesPerRev: 0 })).toThrowError(/pulsesPerRev/);
  });
});
