import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { referenceSignal } from '../../../fixtures/diagnosis/reference-signal.js';
import { add, gaussianNoise, peakFilteredImpulses, sine } from '../test/signals.js';
import { spectralKurtosis } from './spectral-kurtosis.js';

const reference = JSON.parse(readFileSync(new URL('../../../fixtures/diagnosis/reference.json', import.meta.url), 'utf8'));

function interior(values: Float64Array): number[] {
  return Array.from(values.subarray(1, values.length - 1));
}

describe('spectralKurtosis', () => {
  it('matches scipy.signal.stft-based SK on the reference signal to 1e-9 (fixtures/diagnosis/make_reference.py)', () => {
    const sk = spectralKurtosis(referenceSignal(), reference.sampleRateHz, { segmentLength: 128, overlapFraction: 0.75 });
    const expected: number[] = reference.spectralKurtosis.values;
    const got = interior(sk.values);
    expect(got).toHaveLength(expected.length);
    for (let i = 0; i < got.length; i++) expect(Math.abs(got[i]! - expected[i]!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(expected[i]!)));
    expect(Array.from(sk.frequenciesHz)).toEqual(reference.spectralKurtosis.frequenciesHz);
  });

  it('is about 0 on stationary Gaussian noise, within the 2/√L null spread (Antoni 2006; check-values §9)', () => {
    const segments = 800;
    const sk = spectralKurtosis(gaussianNoise(128 * segments, 5), 1000, { segmentLength: 128, overlapFraction: 0 });
    expect(sk.segments).toBe(segments);
    const values = interior(sk.values).sort((a, b) => a - b);
    const median = values[Math.floor(values.length / 2)]!;
    expect(Math.abs(median)).toBeLessThan(2 / Math.sqrt(segments));
    for (const v of values) expect(Math.abs(v)).toBeLessThan(5 * (2 / Math.sqrt(segments)));
  });

  it('is −1 at the frequency of a pure tone (check-values §9)', () => {
    // 0.1 cycles per sample: bin 12.8 of 128, as in the check-values script.
    const sk = spectralKurtosis(sine(200_000, 1, 0.1), 1, { segmentLength: 256 });
    const bin = Math.round(0.1 * 256);
    expect(sk.values[bin]).toBeCloseTo(-1, 6);
  });

  it('peaks in the 3.1–3.3 kHz bins for 100/s impacts through a 3 kHz resonance plus noise (check-values §9)', () => {
    // The check-values setup: fs 20 kHz, impulses every 200 samples through iirpeak(3000 Hz, Q = 20) × 50, noise σ 0.3,
    // SK on 128-sample Hann segments with 3/4 overlap; scipy put the peak at 3281 Hz, value 0.86.
    const fs = 20000;
    const n = 200_000;
    const x = add(peakFilteredImpulses(n, fs, 200, 3000, 20, 50), gaussianNoise(n, 11, 0.3));
    const sk = spectralKurtosis(x, fs, { segmentLength: 128, overlapFraction: 0.75 });
    let at = 1;
    for (let k = 1; k < sk.values.length - 1; k++) if (sk.values[k]! > sk.values[at]!) at = k;
    expect(sk.frequenciesHz[at]).toBeGreaterThanOrEqual(3100);
    expect(sk.frequenciesHz[at]).toBeLessThanOrEqual(3300);
    expect(sk.values[at]).toBeGreaterThan(0.7);
    expect(sk.values[at]).toBeLessThan(1.0);
  });

  it('leaves out the real-valued DC and Nyquist bins', () => {
    const sk = spectralKurtosis(gaussianNoise(4096, 3), 1000, { segmentLength: 64 });
    expect(Number.isNaN(sk.values[0])).toBe(true);
    expect(Number.isNaN(sk.values[32])).toBe(true);
  });

  it('rejects a segment length that is not a power of two, naming the parameter', () => {
    expect(() => spectralKurtosis(new Float64Array(1000), 1000, { segmentLength: 100 })).toThrow(/segmentLength/);
    expect(() => spectralKurtosis(new Float64Array(10), 1000, { segmentLength: 64 })).toThrow(/samples/);
    expect(() => spectralKurtosis(new Float64Array(1000), 1000, { overlapFraction: 1 })).toThrow(/overlapFraction/);
  });
});
