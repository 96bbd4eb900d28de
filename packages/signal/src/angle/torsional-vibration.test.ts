import { describe, expect, it } from 'vitest';
import { detectPulses } from './pulse-detection.js';
import { valueAtOrder } from './order-spectrum.js';
import { speedFromPulses } from './pulse-speed.js';
import { torsionalVibration } from './torsional-vibration.js';

/** Pulse times of θ(t) = f·t + Σ (A_m/360)·sin(2π·m·f·t + φ_m) revolutions (A in degrees), by Newton's method. */
function pulseTimes(f: number, parts: Array<{ order: number; amplitudeDeg: number; phaseRad: number }>, ppr: number, durationS: number): number[] {
  const theta = (t: number) => f * t + parts.reduce((s, p) => s + (p.amplitudeDeg / 360) * Math.sin(2 * Math.PI * p.order * f * t + p.phaseRad), 0);
  const rate = (t: number) => f + parts.reduce((s, p) => s + (p.amplitudeDeg / 360) * 2 * Math.PI * p.order * f * Math.cos(2 * Math.PI * p.order * f * t + p.phaseRad), 0);
  const out: number[] = [];
  let t = 0;
  for (let k = 0; ; k++) {
    for (let it = 0; it < 30; it++) t -= (theta(t) - k / ppr) / rate(t);
    if (t > durationS) return out;
    if (t >= 0) out.push(t);
  }
}

function squareWave(times: number[], fs: number, count: number): Float64Array {
  const x = new Float64Array(count);
  const edge = 2 / fs;
  for (let k = 0; k + 1 < times.length; k++) {
    const start = times[k]!;
    const width = (times[k + 1]! - start) / 2;
    for (let i = Math.floor(start * fs); i <= Math.ceil((start + width + edge) * fs) && i < count; i++) {
      const t = i / fs - start;
      if (t >= 0) x[i] = 5 * (t < edge ? t / edge : t < width ? 1 : Math.max(0, 1 - (t - width) / edge));
    }
  }
  return x;
}

describe('torsionalVibration', () => {
  it('recovers the angle and angular-velocity fluctuation of an encoder shaft at each order', () => {
    const f = 20;
    const ppr = 60;
    const fs = 102_400;
    const parts = [
      { order: 1, amplitudeDeg: 0.3, phaseRad: 0.4 },
      { order: 5, amplitudeDeg: 0.05, phaseRad: -1.2 },
    ];
    const times = pulseTimes(f, parts, ppr, 4.2);
    const edges = detectPulses(squareWave(times, fs, Math.round(4.2 * fs)), fs).edgeTimesS;
    const tv = torsionalVibration(speedFromPulses(edges, { pulsesPerRev: ppr }), { angleUnit: 'deg' });
    expect(tv.meanSpeedHz).toBeCloseTo(f, 3);
    for (const p of parts) {
      const angle = valueAtOrder(tv.angleSpectrum, p.order, 0.5 * tv.angleSpectrum.orderResolution);
      expect(Math.abs(angle.value / p.amplitudeDeg - 1)).toBeLessThan(0.01);
      // calculus: the velocity of θ = A·sin(m·ω·t) swings m·ω·A; the pitch average scales it by sin(πm/P)/(πm/P)
      const x = (Math.PI * p.order) / ppr;
      const expected = p.order * 2 * Math.PI * f * ((p.amplitudeDeg * Math.PI) / 180) * (Math.sin(x) / x);
      const velocity = valueAtOrder(tv.velocitySpectrum, p.order, 0.5 * tv.velocitySpectrum.orderResolution);
      expect(Math.abs(velocity.value / expected - 1)).toBeLessThan(0.01);
    }
    expect(tv.angleSpectrum.valueUnit).toBe('deg');
    expect(tv.velocitySpectrum.valueUnit).toBe('rad/s');
  });

  it('sees no torsional vibration on a shaft accelerating smoothly', () => {
    const ppr = 32;
    const times: number[] = [];
    for (let k = 0; ; k++) {
      const t = (-10 + Math.sqrt(100 + (2 * 4 * k) / ppr)) / 4; // f = 10 + 4t
      if (t > 3) break;
      times.push(t);
    }
    const tv = torsionalVibration(speedFromPulses(Float64Array.from(times), { pulsesPerRev: ppr }), { angleUnit: 'rad' });
    expect(Math.max(...Array.from(tv.angleFluctuation).map(Math.abs))).toBeLessThan(1e-9);
  });
});
