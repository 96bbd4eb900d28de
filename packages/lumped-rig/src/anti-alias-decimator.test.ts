// Sources: windowed-sinc decimation and the Blackman window's -58 dB sidelobes (Harris, Proc. IEEE 66:51-83, 1978; common practice).
import { describe, expect, it } from 'vitest';
import { antiAliasTaps, decimate } from './anti-alias-decimator.js';

function toneAmplitudeAfter(factor: number, fractionOfOutputRate: number): number {
  const fsOut = 10_000;
  const fsIn = factor * fsOut;
  const f = fractionOfOutputRate * fsOut;
  const n = 40_000 * factor;
  const x = Float64Array.from({ length: n }, (_, k) => Math.sin((2 * Math.PI * f * k) / fsIn));
  const half = (antiAliasTaps(factor).length - 1) / 2;
  const y = decimate(x, factor, half, Math.floor((n - 2 * half) / factor) - 1);
  // Amplitude by least squares against the expected output tone (cos and sin parts), so that an alias shows as a small residue.
  let c = 0;
  let s = 0;
  for (let m = 0; m < y.length; m++) {
    const t = (half + m * factor) / fsIn;
    c += y[m]! * Math.cos(2 * Math.PI * f * t);
    s += y[m]! * Math.sin(2 * Math.PI * f * t);
  }
  const rms = Math.sqrt(y.reduce((a, v) => a + v * v, 0) / y.length);
  return Math.max((2 * Math.hypot(c, s)) / y.length, rms * Math.SQRT2);
}

describe('decimate (windowed-sinc anti-alias filter)', () => {
  it('has unit gain at DC', () => {
    for (const factor of [2, 3, 5]) expect(antiAliasTaps(factor).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it('passes tones up to 0.4 of the output rate within 0.1 dB', () => {
    for (const factor of [2, 4]) {
      for (const fr of [0.05, 0.2, 0.4]) expect(Math.abs(20 * Math.log10(toneAmplitudeAfter(factor, fr)))).toBeLessThan(0.1);
    }
  });

  it('removes tones that would alias (0.55-0.9 of the output rate) by more than 50 dB (Blackman sidelobes, −58 dB)', () => {
    for (const factor of [2, 4]) {
      for (const fr of [0.55, 0.7, 0.9]) expect(20 * Math.log10(toneAmplitudeAfter(factor, fr))).toBeLessThan(-50);
    }
  });

  it('copies the samples for a factor of 1 and names a short input', () => {
    expect(Array.from(decimate(Float64Array.of(1, 2, 3, 4), 1, 1, 2))).toEqual([2, 3]);
    expect(() => decimate(new Float64Array(10), 2, 0, 5)).toThrow(/too short/);
  });
});
