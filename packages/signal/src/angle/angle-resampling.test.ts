import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import { resampleToAngle } from './angle-resampling.js';
import { orderSpectrum, valueAtOrder } from './order-spectrum.js';
import { shaftAngleFromLaw } from './shaft-angle.js';

// numpy/scipy reference vectors, made by fixtures/angle/make_reference.py (check-values §10 worked case).
const reference = JSON.parse(readFileSync(new URL('../../../../fixtures/angle/reference.json', import.meta.url), 'utf8'));

const fs = 10_000;
const n = 40_000;
// Linear speed ramp 10 -> 30 Hz over 4 s: θ/2π = f0·t + ½·(f1 − f0)/T·t² (check-values §10).
const rampRevolutions = (t: number) => 10 * t + 0.5 * (20 / 4) * t * t;

function chirp(components: Array<{ order: number; amplitude: number; phaseRad: number }>): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const theta = 2 * Math.PI * rampRevolutions(i / fs);
    for (const c of components) x[i] += c.amplitude * Math.cos(c.order * theta + c.phaseRad);
  }
  return x;
}

describe('resampleToAngle', () => {
  it('reproduces numpy.interp resampling of the check-values §10 ramp and its Hann order spectrum', () => {
    const ref = reference.linearCot;
    const x = chirp([{ order: 8, amplitude: 1, phaseRad: 0 }]);
    const angle = shaftAngleFromLaw(rampRevolutions, n, fs);
    const signal = resampleToAngle(x, fs, angle, { samplesPerRev: 64, interpolation: 'linear', antiAlias: false, startRevolution: 0 });
    expect(signal.revolutions).toBe(ref.revolutions);
    ref.resampledHead.forEach((v: number, k: number) => expect(signal.samples[k]).toBeCloseTo(v, 10));
    ref.resampledAt2000.forEach((v: number, k: number) => expect(signal.samples[2000 + k]).toBeCloseTo(v, 10));
    const spectrum = orderSpectrum(signal, { scaling: 'peak', window: 'hann', detrend: 'none' });
    expect(spectrum.orderResolution).toBeCloseTo(ref.orderResolution, 12);
    let best = 0;
    for (let k = 1; k < spectrum.values.length; k++) if (spectrum.values[k]! > spectrum.values[best]!) best = k;
    expect(spectrum.orders[best]).toBeCloseTo(ref.peakOrder, 12);
    expect(spectrum.values[best]).toBeCloseTo(ref.peakAmplitude, 6);
  });

  it('recovers each order of a chirped multi-harmonic signal within 1 % where the frequency spectrum smears it', () => {
    const { components, frequencySpectrum } = reference.multiHarmonicChirp;
    const x = chirp(components);
    const signal = resampleToAngle(x, fs, shaftAngleFromLaw(rampRevolutions, n, fs), { maxOrder: 20 });
    expect(signal.interpolation).toBe('sinc');
    // Whole revolutions from revolution 1, so each order 1, 3.5, 8, 17 falls on a bin (resolution 1/79 order).
    const spectrum = orderSpectrum(signal, { scaling: 'peak' });
    for (const c of components) {
      const measured = valueAtOrder(spectrum, c.order, 0.5 * spectrum.orderResolution);
      expect(measured.order).toBeCloseTo(c.order, 6);
      // Common practice: computed order tracking keeps a shaft-locked component in one order bin.
      expect(Math.abs(measured.value / c.amplitude - 1)).toBeLessThan(0.01);
    }
    // The frequency spectrum (scipy periodogram, Hann, same record) spreads each order over the band it sweeps.
    for (const s of frequencySpectrum) expect(s.frequencySpectrumMax).toBeLessThan(0.3 * s.amplitude);
  });

  it('keeps the cubic interpolation error within its bound (3/128)·ω⁴ at half-sample offsets', () => {
    // Keys (1981) cubic at offset ½: gain (9/8)cos(ω/2) − (1/8)cos(3ω/2) = 1 − (3/128)ω⁴ + O(ω⁶) (Taylor expansion, derived in angle-resampling.ts).
    const shaftHz = 10;
    const samplesPerRev = 100; // one output sample per input sample...
    const m = 10; // order 10 at 10 Hz = 100 Hz = 0.1 fs at fs = 1000
    const rate = 1000;
    const count = 4000;
    const x = new Float64Array(count);
    for (let i = 0; i < count; i++) x[i] = Math.cos((2 * Math.PI * m * shaftHz * i) / rate);
    const angle = shaftAngleFromLaw((t) => shaftHz * t, count, rate);
    const signal = resampleToAngle(x, rate, angle, { samplesPerRev, interpolation: 'cubic', antiAlias: false, startRevolution: 1 + 0.5 / samplesPerRev });
    const w = (2 * Math.PI * m * shaftHz) / rate;
    const bound = (3 / 128) * w ** 4;
    let worst = 0;
    for (let j = 0; j < signal.samples.length; j++) {
      const exact = Math.cos(2 * Math.PI * m * (signal.startRevolution + j / samplesPerRev));
      worst = Math.max(worst, Math.abs(signal.samples[j]! - exact));
    }
    expect(worst).toBeLessThanOrEqual(bound * 1.01);
    expect(worst).toBeGreaterThan(0.5 * bound);
  });

  it('resamples any in-band shaft-locked sinusoid at constant speed to within 1e-3 (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 60, noNaN: true }),
        fc.double({ min: 0.5, max: 12, noNaN: true }),
        fc.double({ min: 0, max: 6.28, noNaN: true }),
        (shaftHz, order, phase) => {
          const rate = 4096;
          const count = 4096;
          fc.pre(order * shaftHz < 0.35 * rate);
          const x = new Float64Array(count);
          for (let i = 0; i < count; i++) x[i] = Math.cos(2 * Math.PI * order * shaftHz * (i / rate) + phase);
          const signal = resampleToAngle(x, rate, shaftAngleFromLaw((t) => shaftHz * t, count, rate), { samplesPerRev: 64, maxOrder: order * 1.2 + 1 });
          // away from the record's ends, where the anti-alias filter rings
          const skip = Math.min(signal.samples.length >> 2, 64 * 2);
          for (let j = skip; j < signal.samples.length - skip; j += 7) {
            const exact = Math.cos(2 * Math.PI * order * (signal.startRevolution + j / 64) + phase);
            if (Math.abs(signal.samples[j]! - exact) > 1e-3) return false;
          }
          return true;
        },
      ),
      { numRuns: 40 },
    );
  });

  it('rejects a shaft that stops and an order the sample rate cannot hold, with typed errors', () => {
    const x = new Float64Array(1000);
    const stopped = shaftAngleFromLaw((t) => (t < 0.05 ? t * 20 : 1), 1000, 10_000);
    expect(() => resampleToAngle(x, 10_000, stopped)).toThrowError(SignalInputError);
    try {
      resampleToAngle(x, 10_000, shaftAngleFromLaw((t) => 50 * t, 1000, 10_000), { maxOrder: 100 });
    } catch (e) {
      expect((e as SignalInputError).code).toBe('order_above_band');
    }
    expect(() => resampleToAngle(x, 10_000, shaftAngleFromLaw((t) => 50 * t, 1000, 10_000), { maxOrder: 100 })).toThrowError(/0.45/);
  });
});

describe('resampleToAngle defaults', () => {
  it('lowers the default maxOrder to what a given samplesPerRev carries at the lowest speed', () => {
    const rate = 10_000;
    const x = new Float64Array(40_000);
    const s = resampleToAngle(x, rate, shaftAngleFromLaw(rampRevolutions, 40_000, rate), { samplesPerRev: 64 });
    // 0.8 × (64/2) × 10 Hz / 30 Hz: the anti-alias stop band (32 × 10 Hz) stays above the pass band (maxOrder × 30 Hz)
    expect(s.maxOrder).toBeCloseTo((0.8 * 32 * 10) / 30, 1);
    expect(s.antiAliasHz![0]).toBeLessThan(s.antiAliasHz![1]);
  });
});
