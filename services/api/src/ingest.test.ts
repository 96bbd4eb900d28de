import { describe, expect, it } from 'vitest';
import type { RecordingAnalysis } from './analysis.js';
import { storedAnalysisJson } from './ingest.js';
import { packSamples, roundToFloat32, unpackSamples } from './samples-codec.js';

describe('storedAnalysisJson', () => {
  const analysis = {
    softwareVersion: 'x',
    speedHz: Number.NaN,
    overall: { velocityRmsMmPerS: 1.23456789012, kurtosis: Number.NaN, bandHz: [10, 1000] },
    indicators: { velocity_rms_mm_per_s: 1.23456789012, crest_factor: 3.14159265358979 },
    spectrum: { frequenciesHz: [0, 3.125, 6.25], values: [0.000123456789, 1.987654321, 42] },
  } as unknown as RecordingAnalysis;
  const stored = JSON.parse(storedAnalysisJson(analysis));

  it('turns numbers JSON cannot carry into null', () => {
    expect(stored.speedHz).toBeNull();
    expect(stored.overall.kurtosis).toBeNull();
  });

  it('keeps overall levels and indicators exact, the values the trends hold', () => {
    expect(stored.overall.velocityRmsMmPerS).toBe(1.23456789012);
    expect(stored.indicators).toEqual({ velocity_rms_mm_per_s: 1.23456789012, crest_factor: 3.14159265358979 });
  });

  it('rounds plot spectra to six significant digits and leaves whole numbers alone', () => {
    expect(stored.spectrum.values).toEqual([0.000123457, 1.98765, 42]);
    expect(stored.spectrum.frequenciesHz).toEqual([0, 3.125, 6.25]);
  });
});

describe('packSamples', () => {
  it('stores each sample as the nearest float32 (IEEE 754, as Math.fround rounds) and reads it back', () => {
    const a = [0.1, -2.5, 3e-7, 1e30];
    const b = [1, 2, 3, 4];
    const bytes = packSamples([Float64Array.from(a), b]);
    expect(bytes.byteLength).toBe(32);
    const [ra, rb] = unpackSamples(bytes.subarray(0), 2);
    expect(Array.from(ra!)).toEqual(a.map(Math.fround));
    expect(Array.from(rb!)).toEqual(b);
    // unaligned input (a driver buffer at an odd offset) reads the same
    const shifted = Buffer.concat([Buffer.from([0]), bytes]).subarray(1);
    expect(Array.from(unpackSamples(shifted, 2)[0]!)).toEqual(a.map(Math.fround));
  });

  it('refuses channels of different lengths', () => {
    expect(() => packSamples([[1, 2], [1]])).toThrow(/every channel must hold 2 samples/);
  });
});

describe('roundToFloat32', () => {
  it('gives in place exactly the values a pack and unpack round trip gives', () => {
    const x = new Float64Array([0.1, -1 / 3, 1e-40, 3.4e38, 123456789.123, 0]);
    const expected = unpackSamples(packSamples([x]), 1)[0]!;
    expect(Array.from(roundToFloat32(x))).toEqual(Array.from(expected));
  });
});
