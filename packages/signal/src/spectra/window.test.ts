import { describe, expect, it } from 'vitest';
import { SignalInputError } from '../errors.js';
import {
  WINDOW_COEFFICIENTS,
  coherentGainOf,
  enbwBinsOf,
  windowAmplitudeResponse,
  windowCoherentGain,
  windowEnbwBins,
  windowSamples,
  type WindowName,
} from './window.js';

const N = 4096;

/** Highest side lobe in dB: the largest response past the main lobe's first null, searched to 60 bins. */
function highestSideLobeDb(name: WindowName): number {
  const step = 1 / 64;
  let v = step;
  let prev = windowAmplitudeResponse(name, 0, N);
  let cur = windowAmplitudeResponse(name, v, N);
  while (cur <= prev || cur > 0.5) {
    prev = cur;
    v += step;
    cur = windowAmplitudeResponse(name, v, N);
  }
  let max = 0;
  for (; v < 60; v += step) max = Math.max(max, windowAmplitudeResponse(name, v, N));
  return 20 * Math.log10(max);
}

const scallopDb = (name: WindowName) => -20 * Math.log10(windowAmplitudeResponse(name, 0.5, N));

describe('windowSamples', () => {
  it('returns the periodic Hann window of scipy.signal.get_window', () => {
    // check-values.md section 1 [COMP]: get_window('hann', 8)
    const expected = [0, 0.146447, 0.5, 0.853553, 1, 0.853553, 0.5, 0.146447];
    const w = windowSamples('hann', 8);
    expected.forEach((e, i) => expect(w[i]).toBeCloseTo(e, 6));
  });

  it("uses scipy's flat-top coefficients, negative end point included", () => {
    // scipy/signal/windows/_windows.py flattop (D'Antona & Ferrero 2006, p. 70), check-values.md section 1 [PUB]
    expect(WINDOW_COEFFICIENTS.flattop).toEqual([0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368]);
    // the periodic window of length 4 is scipy's flattop(5) without its last point:
    // [-4.21051e-4, -5.473684e-2, 1.0, -5.473684e-2, -4.21051e-4] [COMP]
    const w = windowSamples('flattop', 4);
    expect(w[0]).toBeCloseTo(-4.21051e-4, 9);
    expect(w[1]).toBeCloseTo(-5.473684e-2, 8);
    expect(w[2]).toBeCloseTo(1.000000003, 9);
    expect(w[3]).toBeCloseTo(-5.473684e-2, 8);
  });

  it('rejects an unknown window by name and a bad length', () => {
    expect(() => windowSamples('kaiser' as WindowName, 8)).toThrow(SignalInputError);
    expect(() => windowSamples('hann', 0)).toThrow(/window length \(0\)/);
  });
});

describe('windowCoherentGain and windowEnbwBins', () => {
  // check-values.md section 1 [COMP], windows.py at N = 4096, periodic
  const computed: Record<WindowName, { cg: number; enbw: number }> = {
    rectangular: { cg: 1.0, enbw: 1.0 },
    hann: { cg: 0.5, enbw: 1.5 },
    hamming: { cg: 0.54, enbw: 1.36283 },
    'blackman-harris': { cg: 0.35875, enbw: 2.00435 },
    flattop: { cg: 0.21558, enbw: 3.77025 },
  };
  for (const [name, ref] of Object.entries(computed) as [WindowName, { cg: number; enbw: number }][]) {
    it(`gives ${name} CG ${ref.cg} and ENBW ${ref.enbw} bins from the closed form and from the samples`, () => {
      expect(Math.abs(windowCoherentGain(name) - ref.cg)).toBeLessThan(1e-3 * ref.cg);
      expect(Math.abs(windowEnbwBins(name) - ref.enbw)).toBeLessThan(1e-3 * ref.enbw);
      const w = windowSamples(name, N);
      expect(coherentGainOf(w)).toBeCloseTo(windowCoherentGain(name), 12);
      expect(enbwBinsOf(w)).toBeCloseTo(windowEnbwBins(name), 12);
    });
  }

  it('gives the exact closed forms: Hann 1.5, Hamming 1.3628258, Blackman-Harris 2.0043529, flat-top 3.7702464', () => {
    // check-values.md section 1, closed forms (a0^2 + sum a_k^2 / 2) / a0^2 [COMP]
    expect(windowEnbwBins('hann')).toBe(1.5);
    expect(windowEnbwBins('hamming')).toBeCloseTo(1.3628257887517146, 14);
    expect(windowEnbwBins('blackman-harris')).toBeCloseTo(2.0043529382170475, 14);
    expect(windowEnbwBins('flattop')).toBeCloseTo(3.7702464474434287, 14);
  });

  it('agrees with Harris (1978) Table 1 within its rounding (CG, ENBW +-0.03 bin)', () => {
    // F. J. Harris, Proc. IEEE 66(1):51-83, 1978, Table 1 (values as reproduced in check-values.md section 1)
    const harris: [WindowName, number, number][] = [
      ['rectangular', 1.0, 1.0],
      ['hann', 0.5, 1.5],
      ['hamming', 0.54, 1.36],
      ['blackman-harris', 0.36, 2.0],
    ];
    for (const [name, cg, enbw] of harris) {
      expect(Math.abs(windowCoherentGain(name) - cg)).toBeLessThanOrEqual(0.005);
      expect(Math.abs(windowEnbwBins(name) - enbw)).toBeLessThanOrEqual(0.03);
    }
  });
});

describe('windowAmplitudeResponse', () => {
  it('matches the computed highest side lobes to 0.05 dB and Harris (1978) to his whole-dB rounding', () => {
    // computed [COMP] check-values.md section 1: -13.26, -31.47, -42.67, -92.01, flat-top -93.0;
    // Harris 1978 Table 1: -13, -32, -43, -92 (whole dB; Hann's -32 is 0.53 dB off the exact periodic value)
    const cases: [WindowName, number, number | null][] = [
      ['rectangular', -13.26, -13],
      ['hann', -31.47, -32],
      ['hamming', -42.67, -43],
      ['blackman-harris', -92.01, -92],
      ['flattop', -93.0, null],
    ];
    for (const [name, computed, harris] of cases) {
      const hsl = highestSideLobeDb(name);
      expect(Math.abs(hsl - computed)).toBeLessThan(0.05);
      if (harris !== null) expect(Math.abs(hsl - harris)).toBeLessThan(0.6);
    }
  });

  it('gives the scalloping losses of Harris (1978) within 0.05 dB', () => {
    // Harris Table 1: rectangular 3.92, Hann 1.42, Blackman-Harris 0.83 dB; computed [COMP] 3.9224, 1.4236,
    // 1.7514 (Hamming; Harris prints 1.78, a known inconsistency), 0.8256, flat-top 0.0098
    expect(Math.abs(scallopDb('rectangular') - 3.92)).toBeLessThan(0.05);
    expect(Math.abs(scallopDb('hann') - 1.42)).toBeLessThan(0.05);
    expect(Math.abs(scallopDb('blackman-harris') - 0.83)).toBeLessThan(0.05);
    expect(scallopDb('rectangular')).toBeCloseTo(3.9224, 3);
    expect(scallopDb('hann')).toBeCloseTo(1.4236, 3);
    expect(scallopDb('hamming')).toBeCloseTo(1.7514, 3);
    expect(scallopDb('blackman-harris')).toBeCloseTo(0.8256, 3);
    expect(scallopDb('flattop')).toBeCloseTo(0.0098, 3);
  });

  it("keeps the flat-top's gain within +0.0023 / -0.0098 dB over +-0.5 bin", () => {
    // check-values.md section 1 [COMP]: flat-top gain deviation within +-0.5 bin
    let max = -Infinity;
    let min = Infinity;
    for (let d = -0.5; d <= 0.5 + 1e-12; d += 1 / 256) {
      const db = 20 * Math.log10(windowAmplitudeResponse('flattop', d, N));
      max = Math.max(max, db);
      min = Math.min(min, db);
    }
    expect(max).toBeCloseTo(0.0023, 4);
    expect(min).toBeCloseTo(-0.0098, 4);
  });

  it('equals the magnitude of the DFT of the window samples at an arbitrary offset', () => {
    // definition W(v) = sum_n w[n] exp(-j 2 pi v n / N), summed directly here as an independent check
    const n = 64;
    for (const name of ['hann', 'flattop', 'blackman-harris'] as const) {
      const w = windowSamples(name, n);
      for (const v of [0.3, 1.7, 4.25]) {
        let re = 0;
        let im = 0;
        let s0 = 0;
        for (let i = 0; i < n; i++) {
          re += w[i] * Math.cos((-2 * Math.PI * v * i) / n);
          im += w[i] * Math.sin((-2 * Math.PI * v * i) / n);
          s0 += w[i];
        }
        expect(windowAmplitudeResponse(name, v, n)).toBeCloseTo(Math.hypot(re, im) / Math.abs(s0), 12);
      }
    }
  });
});
