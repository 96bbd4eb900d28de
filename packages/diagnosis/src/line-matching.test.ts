import { noiseFloor, welchSpectrum } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, sine } from '../test/signals.js';
import { lineToleranceHz, matchableSpectrum, matchLine, toneFrequencySigmaBins } from './line-matching.js';

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

describe('toneFrequencySigmaBins: how well a tone’s frequency is read at its SNR', () => {
  // Rife & Boorstyn (IEEE Trans. IT 20:591–598, 1974): the Cramér–Rao bound of a sinusoid's frequency in white noise,
  // 0.225/√SNR_bin bins for a Hann peak bin (derivation beside the function). The function allows three times the bound;
  // the scatter of interpolated frequencies of simulated tones (2.4–2.6 times the bound here) must lie between the two.
  it('lies between the Cramér–Rao bound and three times it for tones at 10 and 20 dB over the floor', () => {
    const fsHz = 1024;
    const length = 1024;
    for (const targetDb of [10, 20]) {
      // One Hann segment: SNR_bin = ρ·N/3 with ρ = A²/(2σ²) per sample.
      const noiseSigma = 1;
      const a = Math.sqrt((2 * noiseSigma ** 2 * 3 * 10 ** (targetDb / 10)) / length);
      const errors: number[] = [];
      for (let trial = 0; trial < 300; trial++) {
        const toneBin = 100.13 + (trial % 7) * 0.11;
        const x = add(sine(length, fsHz, toneBin, a, trial * 0.7), gaussianNoise(length, 1000 + trial, noiseSigma));
        const spectrum = welchSpectrum(x, fsHz, { segmentLength: length, scaling: 'peak', window: 'hann' });
        const m = matchableSpectrum(spectrum, noiseFloor(spectrum));
        const match = matchLine(m, { frequencyHz: toneBin, amplitude: 1, label: 'tone', order: 0 }, 2, 0);
        if (match.matched) errors.push(match.measuredHz! - toneBin);
      }
      const mean = errors.reduce((s, e) => s + e, 0) / errors.length;
      const sd = Math.sqrt(errors.reduce((s, e) => s + (e - mean) ** 2, 0) / (errors.length - 1));
      const bound = toneFrequencySigmaBins(targetDb) / 3;
      // A robust spread (1.4826 × median absolute deviation): a few noise peaks picked instead of the tone would
      // dominate a standard deviation at 10 dB.
      const deviations = errors.map((e) => Math.abs(e - mean)).sort((p, q) => p - q);
      const spread = 1.4826 * deviations[Math.floor(deviations.length / 2)]!;
      expect(errors.length).toBeGreaterThan(280);
      expect(spread).toBeGreaterThan(0.9 * bound);
      expect(spread).toBeLessThan(toneFrequencySigmaBins(targetDb));
    }
  });

  it('rejects a strong tone 0.4 bin off a line placed exactly by the speed, and keeps one 0.05 bin off', () => {
    const m = measured(); // the tone at 437.37 Hz stands some 40 dB over the floor (1 Hz bins)
    const line = (frequencyHz: number) => ({ frequencyHz, amplitude: 1, label: '1×', order: 1, toleranceBins: 0.5, snrTolerance: true });
    const tol = (l: ReturnType<typeof line>) => lineToleranceHz(l, { frequencyResolutionHz: 1, speedUncertaintyHz: 0 });
    const off = line(toneHz - 0.4);
    expect(matchLine(m, off, tol(off)).matched).toBe(false);
    const on = line(toneHz - 0.05);
    expect(matchLine(m, on, tol(on)).matched).toBe(true);
  });
});
