import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { detectPulses, pulsesFromCounts } from './pulse-detection.js';

/** A train of trapezoidal pulses with linear edges `edgeS` long starting at `starts` (s), `widthS` wide, `highV` tall. */
function trapezoids(starts: number[], sampleRateHz: number, count: number, widthS: number, edgeS: number, highV = 5, baseV = 0): Float64Array {
  const x = new Float64Array(count).fill(baseV);
  for (const s of starts) {
    const first = Math.max(0, Math.floor(s * sampleRateHz));
    const last = Math.min(count - 1, Math.ceil((s + widthS + edgeS) * sampleRateHz));
    for (let i = first; i <= last; i++) {
      const t = i / sampleRateHz - s;
      const level = t < 0 ? 0 : t < edgeS ? t / edgeS : t < widthS ? 1 : t < widthS + edgeS ? 1 - (t - widthS) / edgeS : 0;
      if (level > 0) x[i] = baseV + (highV - baseV) * level;
    }
  }
  return x;
}

describe('detectPulses', () => {
  it('times linear edges between samples at the mid-level crossing', () => {
    const fs = 1000;
    const starts = [0.0123, 0.1377, 0.25, 0.3911];
    const edge = 0.004;
    const x = trapezoids(starts, fs, 500, 0.02, edge);
    const p = detectPulses(x, fs);
    expect(p.edgeTimesS.length).toBe(4);
    // mid-level 2.5 V of a 0-5 V edge is reached half-way up the ramp (geometry of a linear edge)
    starts.forEach((s, k) => expect(p.edgeTimesS[k]).toBeCloseTo(s + edge / 2, 9));
    expect(p.upperThreshold).toBeCloseTo(3, 9);
    expect(p.lowerThreshold).toBeCloseTo(2, 9);
  });

  it('gives one edge for a slow noisy edge, thanks to the hysteresis', () => {
    const fs = 10_000;
    const x = trapezoids([0.01, 0.05], fs, 1000, 0.01, 0.005);
    // ±0.4 V dither on a 5 V pulse: it crosses the mid-level many times on each slow edge, never both thresholds
    for (let i = 0; i < x.length; i++) x[i] += 0.4 * Math.sin(i * 2.1);
    const p = detectPulses(x, fs, { upperThreshold: 3.25, lowerThreshold: 1.75, debounceS: 0 });
    expect(p.edgeTimesS.length).toBe(2);
    // the same trigger with almost no hysteresis chatters on each edge
    expect(detectPulses(x, fs, { upperThreshold: 2.51, lowerThreshold: 2.49, debounceS: 0 }).edgeTimesS.length).toBeGreaterThan(4);
  });

  it('ignores a second edge inside the debounce time and counts it', () => {
    const fs = 10_000;
    const x = trapezoids([0.01, 0.0105, 0.05], fs, 1000, 0.0002, 0.0001);
    const p = detectPulses(x, fs, { debounceS: 0.002 });
    expect(p.edgeTimesS.length).toBe(2);
    expect(p.debouncedEdges).toBe(1);
  });

  it('finds notches below the base line with negative polarity', () => {
    const fs = 5000;
    const x = trapezoids([0.02, 0.07, 0.12], fs, 1000, 0.003, 0.001, -4, 1);
    const p = detectPulses(x, fs, { polarity: 'negative' });
    expect(p.edgeTimesS.length).toBe(3);
    expect(p.edgeTimesS[1]).toBeCloseTo(0.07 + 0.0005, 6);
  });

  it('rejects a flat channel with the no_pulses code', () => {
    expect(() => detectPulses(new Float64Array(100).fill(1), 1000)).toThrowError(SignalInputError);
    try {
      detectPulses(new Float64Array(100).fill(1), 1000);
    } catch (e) {
      expect((e as SignalInputError).code).toBe('no_pulses');
    }
  });

  it('finds every pulse of a random train with noise below the hysteresis, each within 1e-6 s (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.004, max: 0.05, noNaN: true }), { minLength: 3, maxLength: 30 }),
        fc.double({ min: 0.5, max: 24, noNaN: true }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.integer({ min: 1, max: 1000 }),
        (gaps, highV, baseV, seed) => {
          const fs = 20_000;
          const starts: number[] = [];
          let t = 0.002;
          for (const g of gaps) {
            starts.push(t);
            t += g;
          }
          const count = Math.ceil((t + 0.01) * fs);
          const edge = 3 / fs;
          const x = trapezoids(starts, fs, count, 0.001, edge, baseV + highV, baseV);
          // deterministic noise of ±5 % of the swing, inside the default 20 % hysteresis band
          let s = seed;
          for (let i = 0; i < count; i++) {
            s = (s * 16807) % 2147483647;
            x[i] += 0.05 * highV * ((s / 2147483647) * 2 - 1) * (i % 3 === 0 ? 1 : 0);
          }
          const p = detectPulses(x, fs);
          if (p.edgeTimesS.length !== starts.length) return false;
          // noise moves the crossing by at most (noise / slope) = 0.05·swing / (swing / edge) = 0.05·edge, plus the half-edge offset
          return starts.every((s0, k) => Math.abs(p.edgeTimesS[k]! - (s0 + edge / 2)) < 0.06 * edge + 1e-6);
        },
      ),
      { numRuns: 60 },
    );
  });
});

describe('pulsesFromCounts', () => {
  it('places the pulses of each count step evenly between the two samples', () => {
    const t = pulsesFromCounts(Float64Array.from([0, 0, 1, 1, 3]), 10);
    expect(Array.from(t)).toEqual([0.15, 0.3 + 0.1 / 3, 0.3 + 0.2 / 3].map((v) => expect.closeTo(v, 12)));
  });

  it('unwraps a counter that rolls over and rejects a falling count otherwise', () => {
    expect(pulsesFromCounts(Float64Array.from([65534, 65535, 0]), 1, { wrapAt: 65536 }).length).toBe(2);
    expect(() => pulsesFromCounts(Float64Array.from([5, 4]), 1)).toThrowError(/wrapAt/);
  });
});
