import { describe, expect, it } from 'vitest';
import { runUpMap } from './run-up.js';
import { shaftAngleFromLaw } from './shaft-angle.js';

describe('runUpMap', () => {
  it('shows an order crossing a natural frequency as a resonance peak at speed = f_n / order', () => {
    // Quasi-static sweep of order 4 through a single-degree-of-freedom resonance at 80 Hz, ζ = 0.05:
    // magnification 1/√((1 − r²)² + (2ζr)²) (common practice; check-values §5), peak ≈ 1/(2ζ) = 10 at r ≈ 1.
    const fs = 4096;
    const durationS = 20;
    const n = fs * durationS;
    const f0 = 10;
    const a = 1; // Hz/s: 10 -> 30 Hz
    const fn = 80;
    const zeta = 0.05;
    const revs = (t: number) => f0 * t + 0.5 * a * t * t;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = i / fs;
      const r = (4 * (f0 + a * t)) / fn;
      const gain = 1 / Math.sqrt((1 - r * r) ** 2 + (2 * zeta * r) ** 2);
      x[i] = 0.1 * gain * Math.cos(2 * Math.PI * 4 * revs(t));
    }
    const map = runUpMap(x, fs, shaftAngleFromLaw(revs, n, fs), { orders: [4], naturalFrequenciesHz: [fn], trackRevolutions: 8 });
    const track = map.orderTracks[0]!.points;
    const best = track.reduce((p, q) => (q.amplitude > p.amplitude ? q : p));
    expect(Math.abs(best.speedRpm - (60 * fn) / 4)).toBeLessThan(30);
    expect(best.amplitude).toBeGreaterThan(0.1 * 9);
    expect(best.amplitude).toBeLessThan(0.1 * 10.1);
    expect(map.crossings).toEqual([{ naturalFrequencyHz: 80, order: 4, speedRpm: 1200, timeS: expect.closeTo(10, 2) }]);
    expect(map.minSpeedRpm).toBeCloseTo(600, -1);
    expect(map.frequencyMap.rows.length).toBeGreaterThan(100);
    // each frequency-map row carries the speed of its block, rising through the run-up
    const rows = map.frequencyMap.rows;
    expect(rows[rows.length - 1]!.speedRpm).toBeGreaterThan(rows[0]!.speedRpm + 1000);
  });
});
