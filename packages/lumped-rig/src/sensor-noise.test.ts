// Sources: Parseval (the PSD integrates to the variance) and the 1/f slope of pink noise (common practice).
import { describe, expect, it } from 'vitest';
import { averagedPsd } from '../test-support/spectrum.js';
import { createRandom } from './random.js';
import { sensorNoise } from './sensor-noise.js';

function bandMean(psd: Float64Array, binHz: number, lo: number, hi: number): number {
  let s = 0;
  let n = 0;
  for (let k = Math.ceil(lo / binHz); k <= Math.floor(hi / binHz); k++) {
    s += psd[k]!;
    n++;
  }
  return s / n;
}

describe('sensorNoise', () => {
  it('white: has the asked r.m.s., a flat PSD of 2σ²/fs, and Σ PSD·Δf equals the variance (Parseval; check-values §2)', () => {
    const fs = 25_600;
    const x = sensorNoise(createRandom(5), 262_144, fs, 0.002, 'white');
    const rms = Math.sqrt(x.reduce((s, v) => s + v * v, 0) / x.length);
    expect(Math.abs(rms / 0.002 - 1)).toBeLessThan(0.01);
    const { psd, binHz } = averagedPsd(x, fs, 1024);
    expect(Math.abs(bandMean(psd, binHz, 100, 12_000) / ((2 * 0.002 ** 2) / fs) - 1)).toBeLessThan(0.03);
    const total = psd.reduce((s, p) => s + p * binHz, 0);
    expect(Math.abs(total / (rms * rms) - 1)).toBeLessThan(0.01);
  });

  it('pink: falls by about 10 dB per decade (1/f) between 20 Hz and 5 kHz, to ±1.5 dB', () => {
    const fs = 20_000;
    const x = sensorNoise(createRandom(6), 524_288, fs, 0.001, 'pink');
    const { psd, binHz } = averagedPsd(x, fs, 4096);
    const decades = [
      [20, 50],
      [200, 500],
      [2000, 5000],
    ].map(([lo, hi]) => 10 * Math.log10(bandMean(psd, binHz, lo!, hi!)));
    expect(Math.abs(decades[0]! - decades[1]! - 10)).toBeLessThan(1.5);
    expect(Math.abs(decades[1]! - decades[2]! - 10)).toBeLessThan(1.5);
  });

  it('is silent at zero level and names a bad argument', () => {
    expect(sensorNoise(createRandom(1), 8, 1000, 0, 'white').every((v) => v === 0)).toBe(true);
    expect(() => sensorNoise(createRandom(1), 8, 0, 1, 'white')).toThrow(/sampleRateHz/);
  });
});
