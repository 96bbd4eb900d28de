import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, impactTrain, peakFilteredImpulses, sine } from '../test/signals.js';
import { fastKurtogram } from './kurtogram.js';

describe('fastKurtogram', () => {
  it('lays out Antoni’s 1/3-binary tree: levels 0, 1, 1.6, 2, 2.6, … with 1, 2, 3, 4, 6, 8 … bands (Antoni 2007)', () => {
    const k = fastKurtogram(gaussianNoise(8192, 1), 1000, { maxLevel: 4 });
    expect(k.levels).toEqual([0, 1, 1.6, 2, 2.6, 3, 3.6, 4]);
    expect(k.bands.map((row) => row.length)).toEqual([1, 2, 3, 4, 6, 8, 12, 16]);
    // Each level tiles 0 .. fs/2 without gaps.
    for (const row of k.bands) {
      expect(row[0]!.lowHz).toBe(0);
      expect(row[row.length - 1]!.highHz).toBe(500);
      for (let i = 1; i < row.length; i++) expect(row[i]!.lowHz).toBe(row[i - 1]!.highHz);
    }
    expect(k.bands[2]![0]!.bandwidthHz).toBeCloseTo(500 / 3, 0);
  });

  it('picks a band containing the resonance that impacts ring (Antoni 2007; check-values §9 setup)', () => {
    const fs = 20000;
    const n = 65536;
    const x = add(peakFilteredImpulses(n, fs, 200, 3000, 20, 50), gaussianNoise(n, 4, 0.3));
    const k = fastKurtogram(x, fs);
    expect(k.best.lowHz).toBeLessThanOrEqual(3000);
    expect(k.best.highHz).toBeGreaterThanOrEqual(3000);
    expect(k.best.kurtosis).toBeGreaterThan(1);
  });

  it('finds a 6.2 kHz resonance under a strong 120 Hz tone and its harmonics (deterministic lines have negative kurtosis)', () => {
    const fs = 25600;
    const n = 32768;
    const tones = add(sine(n, fs, 120, 5), sine(n, fs, 240, 2), sine(n, fs, 1800, 3));
    const impacts = impactTrain({ sampleRateHz: fs, length: n, rateHz: 87.3, resonanceHz: 6200, dampingRatio: 0.04, amplitude: 1, jitterFraction: 0.02 });
    const k = fastKurtogram(add(tones, impacts, gaussianNoise(n, 9, 0.2)), fs, { minBandwidthHz: 400 });
    expect(k.best.lowHz).toBeLessThanOrEqual(6200);
    expect(k.best.highHz).toBeGreaterThanOrEqual(6200);
    expect(k.best.bandwidthHz).toBeGreaterThanOrEqual(400);
  });

  it('stays near 0 on Gaussian noise, within the estimator spread of its narrowest bands', () => {
    const k = fastKurtogram(gaussianNoise(32768, 21), 10000);
    // Narrowest bands hold 32768 / 2^8 = 128 envelope samples: null spread about 2/√128 = 0.18 (Antoni 2006).
    expect(k.best.kurtosis).toBeLessThan(5 * (2 / Math.sqrt(128)));
    expect(Math.abs(k.bands[0]![0]!.kurtosis)).toBeLessThan(0.1);
  });

  it('gives −1 for a band holding one pure tone', () => {
    const k = fastKurtogram(sine(16384, 1000, 123.4, 1), 1000, { maxLevel: 3 });
    const band = k.bands[k.levels.indexOf(3)]!.find((b) => b.lowHz <= 123.4 && b.highHz > 123.4)!;
    expect(band.kurtosis).toBeCloseTo(-1, 1);
  });

  it('respects the search range and minimum bandwidth when choosing the best band', () => {
    const fs = 20000;
    const n = 32768;
    const x = add(peakFilteredImpulses(n, fs, 200, 3000, 20, 50), gaussianNoise(n, 4, 0.3));
    const k = fastKurtogram(x, fs, { searchRangeHz: [5000, 10000], minBandwidthHz: 1000 });
    expect(k.best.lowHz).toBeGreaterThanOrEqual(5000);
    expect(k.best.bandwidthHz).toBeGreaterThanOrEqual(1000);
  });

  it('rejects a record too short for a kurtogram, naming the parameter', () => {
    expect(() => fastKurtogram(new Float64Array(100), 1000)).toThrow(/samples/);
    expect(() => fastKurtogram(new Float64Array(1000), 0)).toThrow(/sampleRateHz/);
  });
});
