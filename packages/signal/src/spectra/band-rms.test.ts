import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { bandRms } from './band-rms.js';
import { welchSpectrum } from './welch.js';

const FS = 10_000;
const x = new Float64Array(1 << 16).map((_, i) => 2 * Math.sin((2 * Math.PI * 120 * i) / FS) + 0.5 * Math.sin((2 * Math.PI * 2400 * i) / FS));

describe('bandRms', () => {
  it('gives each sine its rms A / sqrt(2) in a band around it, for every window and scaling', () => {
    // rms of a sine = peak / sqrt(2) (common practice); the ENBW correction makes the window irrelevant
    for (const window of ['hann', 'flattop', 'rectangular', 'hamming', 'blackman-harris'] as const) {
      for (const scaling of ['psd', 'power', 'rms', 'peak'] as const) {
        const s = welchSpectrum(x, FS, { window, scaling, segmentLength: 4096 });
        expect(bandRms(s, [50, 200]) / Math.SQRT2).toBeCloseTo(1, 2);
        expect(bandRms(s, [2000, 3000]) / (0.5 / Math.SQRT2)).toBeCloseTo(1, 2);
        // Parseval over the whole spectrum: sqrt(2^2/2 + 0.5^2/2)
        expect(Math.abs(bandRms(s) / Math.sqrt(2 + 0.125) - 1)).toBeLessThan(0.005);
      }
    }
  });

  it('counts the bins whose centre lies inside the band, both edges included', () => {
    const s = welchSpectrum(x, FS, { window: 'rectangular', scaling: 'power', segmentLength: 1000, detrend: 'none' });
    // 120 Hz is the bin centre k = 12 (df = 10 Hz) and the record holds whole cycles per segment
    expect(bandRms(s, [120, 130])).toBeCloseTo(Math.SQRT2, 9);
    expect(bandRms(s, [110, 120])).toBeCloseTo(Math.SQRT2, 9);
    expect(bandRms(s, [120.5, 130.5])).toBeLessThan(1e-9);
    expect(bandRms(s, [109.5, 119.9])).toBeLessThan(1e-9);
  });

  it('rejects an inverted band and a band with no line', () => {
    const s = welchSpectrum(x, FS, { segmentLength: 1024 });
    expect(() => bandRms(s, [300, 100])).toThrow(SignalInputError);
    expect(() => bandRms(s, [9000, 9500])).toThrow(/holds no spectral line/);
  });
});
