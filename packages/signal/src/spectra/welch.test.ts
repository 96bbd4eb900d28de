import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { reference, slice, type WelchCase } from '../../../../fixtures/spectra/welch-reference.js';
import { SignalInputError } from '../errors.js';
import { bandRms } from './band-rms.js';
import type { DetrendMode } from './detrend.js';
import type { AveragingMode, SpectrumScaling } from './spectrum.js';
import { magnitudeSpectrum, welchPsd, welchSpectrum } from './welch.js';
import type { WindowName } from './window.js';

const WINDOW: Record<WelchCase['window'], WindowName> = {
  boxcar: 'rectangular',
  hann: 'hann',
  hamming: 'hamming',
  blackmanharris: 'blackman-harris',
  flattop: 'flattop',
};
const DETREND = (d: WelchCase['detrend']): DetrendMode => (d === false ? 'none' : d === 'constant' ? 'mean' : 'linear');
const SCALING: Record<WelchCase['scaling'], SpectrumScaling> = { density: 'psd', spectrum: 'power' };
const AVERAGE: Record<WelchCase['average'], AveragingMode> = { mean: 'linear', max: 'peak-hold' };

/**
 * Largest relative difference over the bins. A bin that is zero in exact arithmetic (the DC line of
 * a mean-removed, rectangular-windowed segment) holds rounding noise in both libraries; bins below
 * 1e-20 of the largest are compared absolutely against that level instead.
 */
function worstRelativeError(actual: Float64Array, expected: Float64Array): number {
  let max = 0;
  for (const v of expected) max = Math.max(max, Math.abs(v));
  const floor = 1e-20 * max;
  let worst = 0;
  for (let i = 0; i < expected.length; i++) {
    const d = Math.abs(actual[i] - expected[i]);
    worst = Math.max(worst, Math.abs(expected[i]) < floor ? d / max : d / Math.abs(expected[i]));
  }
  return worst;
}

function seededNoise(seed: number, n: number): Float64Array {
  // xorshift32 + Box-Muller: reproducible test input, not a reference value
  let s = seed >>> 0 || 1;
  const u = () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return (s + 0.5) / 4294967296;
  };
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
  return out;
}

describe('welchSpectrum', () => {
  // Reference: scipy.signal.welch (scipy 1.17.1) on the same samples; peak hold from numpy on scipy's segments.
  // fixtures/spectra/make_welch_fixtures.py wrote them.
  for (const c of reference.welch) {
    const label = `${c.signal}: ${c.window} nperseg=${c.nperseg} noverlap=${c.noverlap} detrend=${String(c.detrend)} ${c.scaling} ${c.average}`;
    it(`matches scipy.signal.welch to 1e-9 relative (${label})`, () => {
      const { sampleRateHz, samples } = reference.signal(c.signal);
      const s = welchSpectrum(samples, sampleRateHz, {
        window: WINDOW[c.window],
        segmentLength: c.nperseg,
        overlapFraction: c.noverlap / c.nperseg,
        detrend: DETREND(c.detrend),
        scaling: SCALING[c.scaling],
        averaging: AVERAGE[c.average],
        unit: 'g',
      });
      const expected = slice(c.values);
      expect(s.values.length).toBe(expected.length);
      expect(s.overlapSamples).toBe(c.noverlap);
      expect(s.averages).toBe(c.segments);
      expect(s.frequencyResolutionHz).toBeCloseTo(c.frequencyResolutionHz, 12);
      expect(s.frequenciesHz[s.frequenciesHz.length - 1]).toBeCloseTo(c.lastFrequencyHz, 9);
      expect(worstRelativeError(s.values, expected)).toBeLessThan(1e-9);
    });
  }

  it('reads a bin-centred 2-unit sine as 2 peak, sqrt(2) rms, 2 power and 2/(1.5 df) psd with Hann', () => {
    // scipy.signal.periodogram check (check-values.md section 2, out_spectra.txt): A = 2 at 64 Hz,
    // fs = 1024, N = 1024: spectrum 2.0, Hann density 1.333333 = A^2/2 / (ENBW 1.5 x df 1 Hz)
    const fs = 1024;
    const x = new Float64Array(1024).map((_, i) => 2 * Math.sin((2 * Math.PI * 64 * i) / fs));
    const at = (scaling: SpectrumScaling) => welchSpectrum(x, fs, { segmentLength: 1024, scaling }).values[64];
    expect(at('power')).toBeCloseTo(2, 12);
    expect(at('psd')).toBeCloseTo(1.333333333333, 9);
    expect(at('rms')).toBeCloseTo(Math.SQRT2, 12);
    expect(at('peak')).toBeCloseTo(2, 12);
  });

  it('gives white noise of variance s^2 a one-sided density of 2 s^2 / fs', () => {
    // one-sided PSD of white noise is 2 sigma^2 / fs (scipy welch docs; check-values.md section 2)
    const sigma = 0.5;
    const fs = 1000;
    const x = seededNoise(7, 200_000).map((v) => v * sigma);
    const s = welchPsd(x, fs, { segmentLength: 1000 });
    let mean = 0;
    for (let k = 1; k < s.values.length - 1; k++) mean += s.values[k];
    mean /= s.values.length - 2;
    expect(mean).toBeGreaterThan(0.98 * ((2 * sigma * sigma) / fs));
    expect(mean).toBeLessThan(1.02 * ((2 * sigma * sigma) / fs));
  });

  it('keeps Parseval: band RMS over the whole spectrum equals the time-domain RMS within 0.5 %', () => {
    // Parseval's theorem with the ENBW correction (issue 2 acceptance: within 0.5 %)
    const fs = 25600;
    const noise = seededNoise(11, 1 << 18);
    const x = noise.map((v, i) => 0.3 * v + 1.2 * Math.sin((2 * Math.PI * 157.3 * i) / fs) + 0.4 * Math.sin((2 * Math.PI * 3011.1 * i) / fs));
    let ms = 0;
    let mean = 0;
    for (const v of x) mean += v;
    mean /= x.length;
    for (const v of x) ms += (v - mean) ** 2;
    const rms = Math.sqrt(ms / x.length);
    for (const window of ['hann', 'rectangular', 'hamming', 'blackman-harris', 'flattop'] as const) {
      for (const scaling of ['psd', 'power', 'rms', 'peak'] as const) {
        const s = welchSpectrum(x, fs, { window, scaling, segmentLength: 4096 });
        expect(Math.abs(bandRms(s) / rms - 1)).toBeLessThan(0.005);
      }
    }
  });

  it('scales linearly: k x the signal gives k^2 x the psd and k x the amplitude (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.constantFrom<WindowName>('hann', 'flattop', 'rectangular', 'hamming', 'blackman-harris'),
        (seed, k, window) => {
          const x = seededNoise(seed, 2048);
          const y = x.map((v) => k * v);
          const a = welchSpectrum(x, 100, { window, segmentLength: 256, scaling: 'psd' });
          const b = welchSpectrum(y, 100, { window, segmentLength: 256, scaling: 'psd' });
          const ap = welchSpectrum(x, 100, { window, segmentLength: 256, scaling: 'peak' });
          const bp = welchSpectrum(y, 100, { window, segmentLength: 256, scaling: 'peak' });
          // the DC line after mean removal is rounding noise, so tolerances are relative to the largest line
          const maxA = Math.max(...a.values);
          const maxP = Math.max(...ap.values);
          for (let i = 0; i < a.values.length; i++) {
            expect(Math.abs(b.values[i] - k * k * a.values[i])).toBeLessThanOrEqual(1e-9 * k * k * maxA);
            expect(Math.abs(bp.values[i] - k * ap.values[i])).toBeLessThanOrEqual(1e-9 * k * maxP);
          }
        },
      ),
      { numRuns: 30 },
    );
  });

  it('keeps Parseval for random records with a rectangular window and one segment (property)', () => {
    // Parseval: sum |X_k|^2 / N^2 over the two-sided DFT equals the mean square; one-sided folding keeps it
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 30 }), fc.integer({ min: 2, max: 700 }), (seed, n) => {
        const x = seededNoise(seed, n);
        let ms = 0;
        for (const v of x) ms += v * v;
        ms /= n;
        const s = magnitudeSpectrum(x, 50, { window: 'rectangular', detrend: 'none', scaling: 'power' });
        expect(bandRms(s) ** 2).toBeCloseTo(ms, 10);
      }),
      { numRuns: 50 },
    );
  });

  it('holds the bin-wise maximum of the segments with peak hold', () => {
    const fs = 1000;
    const x = seededNoise(3, 4096);
    const held = welchSpectrum(x, fs, { segmentLength: 512, overlapFraction: 0, averaging: 'peak-hold', scaling: 'power' });
    const segs = Array.from({ length: 8 }, (_, s) =>
      magnitudeSpectrum(x.subarray(s * 512, (s + 1) * 512), fs, { scaling: 'power' }),
    );
    for (let k = 0; k < held.values.length; k++) {
      const max = Math.max(...segs.map((g) => g.values[k]));
      expect(held.values[k]).toBeCloseTo(max, 12);
    }
    const mean = welchSpectrum(x, fs, { segmentLength: 512, overlapFraction: 0, scaling: 'power' });
    for (let k = 0; k < held.values.length; k++) expect(held.values[k]).toBeGreaterThanOrEqual(mean.values[k] * (1 - 1e-12));
  });

  it('reports its settings: window, segment, overlap, averages, resolution, ENBW and units', () => {
    const x = seededNoise(5, 10_000);
    const s = welchSpectrum(x, 2000, { segmentLength: 1024, overlapFraction: 0.5, window: 'hann', unit: 'g' });
    expect(s).toMatchObject({
      window: 'hann',
      segmentLength: 1024,
      overlapSamples: 512,
      overlapFraction: 0.5,
      averages: Math.floor((10_000 - 512) / 512),
      frequencyResolutionHz: 2000 / 1024,
      scaling: 'psd',
      unit: 'g',
      valueUnit: 'g^2/Hz',
      sampleRateHz: 2000,
    });
    // Harris (1978) / check-values.md section 1: periodic Hann ENBW is exactly 1.5 bins
    expect(s.enbwBins).toBeCloseTo(1.5, 12);
    expect(s.frequenciesHz.length).toBe(513);
  });

  it('defaults to 8192-sample segments, or the largest power of two that fits a shorter record', () => {
    expect(welchSpectrum(seededNoise(1, 20_000), 100).segmentLength).toBe(8192);
    expect(welchSpectrum(seededNoise(1, 5000), 100).segmentLength).toBe(4096);
  });

  it('returns a spectrum or throws SignalInputError, nothing else, for any options (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 600 }),
        fc.oneof(fc.integer({ min: -5, max: 700 }), fc.double(), fc.constant(undefined)),
        fc.oneof(fc.double(), fc.constant(undefined)),
        fc.oneof(fc.constantFrom('hann', 'flattop', 'rectangular', 'hamming', 'blackman-harris'), fc.string()),
        fc.oneof(fc.constantFrom('psd', 'power', 'rms', 'peak'), fc.string()),
        fc.oneof(fc.double(), fc.constant(1000)),
        (n, segmentLength, overlapFraction, window, scaling, fs) => {
          const x = seededNoise(n + 1, n);
          try {
            const s = welchSpectrum(x, fs, {
              segmentLength: segmentLength as number | undefined,
              overlapFraction: overlapFraction as number | undefined,
              window: window as WindowName,
              scaling: scaling as SpectrumScaling,
            });
            expect(s.values.length).toBe(Math.floor(s.segmentLength / 2) + 1);
            for (const v of s.values) expect(Number.isFinite(v) && v >= 0).toBe(true);
          } catch (e) {
            expect(e).toBeInstanceOf(SignalInputError);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it('rejects bad input with typed errors that name the parameter', () => {
    const x = seededNoise(2, 1000);
    const code = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        expect(e).toBeInstanceOf(SignalInputError);
        return (e as SignalInputError).code;
      }
      return 'no error';
    };
    expect(code(() => welchSpectrum(x, 100, { segmentLength: 2048 }))).toBe('segment_too_long');
    expect(code(() => welchSpectrum(x, 0))).toBe('sample_rate_invalid');
    expect(code(() => welchSpectrum(x, 100, { overlapFraction: 1 }))).toBe('invalid_overlap');
    expect(code(() => welchSpectrum(x, 100, { segmentLength: 1.5 }))).toBe('invalid_segment_length');
    expect(code(() => welchSpectrum(x, 100, { window: 'kaiser' as WindowName }))).toBe('unknown_window');
    expect(code(() => welchSpectrum(x, 100, { scaling: 'dB' as SpectrumScaling }))).toBe('unknown_scaling');
    expect(code(() => welchSpectrum(x, 100, { detrend: 'quadratic' as DetrendMode }))).toBe('unknown_detrend');
    expect(code(() => welchSpectrum(new Float64Array(1), 100))).toBe('record_too_short');
    const bad = x.slice();
    bad[17] = Number.NaN;
    expect(code(() => welchSpectrum(bad, 100))).toBe('non_finite_sample');
    expect(() => welchSpectrum(x, 100, { segmentLength: 2048 })).toThrow(/segmentLength \(2048\)/);
  });
});
