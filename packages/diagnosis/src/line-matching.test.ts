import { noiseFloor, welchSpectrum } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, sine } from '../test/signals.js';
import { lineToleranceHz, matchableSpectrum, matchLine } from './line-matching.js';

const fs = 8192;
const n = 8192 * 8;
const segmentLength = 8192;
const sigma = 0.01;
const amplitude = 0.2;
const toneHz = 437.37; // between bins (1 Hz bins)

function measured() {
  const x = add(sine(n, fs, toneHz, amplitude, 0.4), gaussianNoise(n, 31, sigma));
  const spectrum = welchSpectrum(x, fs, { segmentLength, scaling: 'peak', window: 'hann' });
  return matchableSpectrum(spectrum, noiseFloor(spectrum));
}

describe('matchLine', () => {
  const m = measured();

  it('finds a sine between bins with its interpolated frequency and peak amplitude (common practice: a sine of amplitude A reads A)', () => {
    const match = matchLine(m, { frequencyHz: 437, amplitude: 1, label: 'test', order: 10 }, 2);
    expect(match.matched).toBe(true);
    expect(Math.abs(match.measuredHz! - toneHz)).toBeLessThan(0.05);
    expect(Math.abs(match.measuredAmplitude! / amplitude - 1)).toBeLessThan(0.01);
  });

  it('reports the SNR of the line over the noise floor expected from the window ENBW (Heinzel, Rüdiger & Schilling 2002)', () => {
    // One-sided power per bin of white noise: 2σ²·ENBW/N; a sine's line power: A²/2. Hann ENBW = 1.5 bins (Harris 1978).
    const expectedDb = 10 * Math.log10((amplitude ** 2 / 2) / ((2 * sigma ** 2 * 1.5) / segmentLength));
    const match = matchLine(m, { frequencyHz: toneHz, amplitude: 1, label: 'test', order: 1 }, 1);
    // The line straddles two bins (scalloping up to 1.4 dB for Hann) and the floor is a median, not a mean (≈ 0.1 dB here).
    expect(match.snrDb).toBeLessThan(expectedDb + 0.5);
    expect(match.snrDb).toBeGreaterThan(expectedDb - 2);
  });

  it('does not match a line predicted further away than its tolerance', () => {
    const match = matchLine(m, { frequencyHz: 445, amplitude: 1, label: 'far', order: 1 }, 2);
    expect(match.matched).toBe(false);
    expect(match.measuredHz).toBeNull();
    expect(match.measuredAmplitude).toBeNull();
    expect(match.upperBoundAmplitude).toBeGreaterThan(0);
  });

  it('does not match pure noise at the 6 dB threshold in most places', () => {
    let hits = 0;
    for (let f = 600; f < 3600; f += 30) if (matchLine(m, { frequencyHz: f, amplitude: 1, label: 'noise', order: 1 }, 1).matched) hits++;
    expect(hits).toBeLessThan(5);
  });
});

describe('lineToleranceHz', () => {
  it('grows with the order times the speed uncertainty and with the line’s own spread', () => {
    expect(lineToleranceHz({ frequencyHz: 100, order: 1 }, { frequencyResolutionHz: 0.5, speedUncertaintyHz: 0 })).toBe(0.5);
    expect(lineToleranceHz({ frequencyHz: 100, order: 4 }, { frequencyResolutionHz: 0.5, speedUncertaintyHz: 0.01 })).toBeCloseTo(0.62, 12);
    expect(lineToleranceHz({ frequencyHz: 100, order: 4, relativeSpreadFraction: 0.01 }, { frequencyResolutionHz: 0.5, speedUncertaintyHz: 0 })).toBeCloseTo(1.5, 12);
  });
});
