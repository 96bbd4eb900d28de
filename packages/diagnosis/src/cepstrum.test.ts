import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fftPlan } from './fft-plan.js';
import { gaussianNoise } from '../test/signals.js';
import { cepstralPeak, powerCepstrum } from './cepstrum.js';

const reference = JSON.parse(readFileSync(new URL('../../../fixtures/diagnosis/reference.json', import.meta.url), 'utf8'));

/** Averaged Hann periodogram (test scaffolding only: the package takes its spectra from @kinespec/signal). */
function averagedPowerSpectrum(x: Float64Array, nfft: number): Float64Array {
  const plan = fftPlan(nfft);
  const out = new Float64Array(2 * nfft);
  const frame = new Float64Array(nfft);
  const p = new Float64Array(nfft / 2 + 1);
  for (let start = 0; start + nfft <= x.length; start += nfft / 2) {
    for (let i = 0; i < nfft; i++) frame[i] = x[start + i]! * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / nfft));
    plan.realTransform(out, frame);
    for (let k = 0; k < p.length; k++) p[k] += out[2 * k]! ** 2 + out[2 * k + 1]! ** 2;
  }
  return p;
}

describe('powerCepstrum', () => {
  it('returns a and b/2 for log P = a + b·cos(2πkm/N), the closed-form inverse transform', () => {
    const nfft = 256;
    const m = 10;
    const a = 0.7;
    const b = 0.3;
    const p = Float64Array.from({ length: nfft / 2 + 1 }, (_, k) => Math.exp(a + b * Math.cos((2 * Math.PI * k * m) / nfft)));
    const c = powerCepstrum(p, 1);
    expect(c.values[0]).toBeCloseTo(a, 12);
    expect(c.values[m]).toBeCloseTo(b / 2, 12);
    expect(c.values[m + 1]).toBeCloseTo(0, 12);
    expect(c.quefrenciesS[m]).toBeCloseTo(m / nfft, 15);
  });

  it('matches numpy irfft(log P) of a scipy Welch spectrum to 1e-9 (fixtures/diagnosis/make_reference.py)', () => {
    const { values, frequencyResolutionHz } = reference.welchPowerSpectrum;
    const c = powerCepstrum(values, frequencyResolutionHz);
    const expected: number[] = reference.powerCepstrum.values;
    expect(c.values).toHaveLength(expected.length);
    for (let i = 0; i < expected.length; i++) expect(Math.abs(c.values[i]! - expected[i]!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(expected[i]!)));
  });

  it('rejects a spectrum whose length is not nfft/2 + 1 for a power-of-two nfft', () => {
    expect(() => powerCepstrum(new Float64Array(100), 1)).toThrow(/powerSpectrum/);
    expect(() => powerCepstrum(new Float64Array(129), 0)).toThrow(/frequencyResolutionHz/);
  });
});

describe('cepstralPeak', () => {
  it('finds the modulating shaft’s period in the cepstrum of a sideband family (common practice)', () => {
    // A 1500 Hz mesh tone modulated once per revolution of a 12.5 Hz shaft by a short pulse: sidebands 1500 ± k·12.5 Hz.
    const fs = 20000;
    const n = 131072;
    const shaftHz = 12.5;
    const x = gaussianNoise(n, 17, 0.05);
    for (let i = 0; i < n; i++) {
      const t = i / fs;
      const phase = (t * shaftHz) % 1;
      const modulation = 1 + 2 * Math.exp(-(((phase - 0.5) / 0.02) ** 2));
      x[i] += modulation * Math.sin(2 * Math.PI * 1500 * t);
    }
    const nfft = 8192;
    const c = powerCepstrum(averagedPowerSpectrum(x, nfft), fs / nfft);
    const peak = cepstralPeak(c, 1 / shaftHz)!;
    expect(peak.quefrencyS).toBeCloseTo(1 / shaftHz, 3);
    expect(peak.prominence).toBeGreaterThan(6);
    // A period that nothing in the signal has stands out far less.
    expect(cepstralPeak(c, 1 / 17.3)!.prominence).toBeLessThan(peak.prominence / 2);
  });

  it('shows no prominent peak on white noise', () => {
    const nfft = 4096;
    const c = powerCepstrum(averagedPowerSpectrum(gaussianNoise(65536, 2), nfft), 10000 / nfft);
    expect(cepstralPeak(c, 0.05)!.prominence).toBeLessThan(5);
  });
});
