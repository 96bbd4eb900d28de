import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignatureInputError } from './errors.js';
import { sampledFourierSeries, sampleSegments } from './fourier-series.js';
import { gearEccentricityExcitation, gearWearExcitation, toothDropExcitation } from './gear-tooth-excitation.js';

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
const lineAt = (lines: ReturnType<typeof toothDropExcitation>['lines'], order: number) => lines.find((l) => Math.abs(l.order! - order) < 1e-9);

describe('toothDropExcitation', () => {
  it('gives the rectangular one-pitch drop of check-values §6 (N_t = 20) and nothing at the mesh harmonics', () => {
    // Missing tooth, rectangular gap of one pitch, depth 1: c_n = −(1/N_t)·sinc(n/N_t), zero at n = k·N_t
    // (check-values.md §6, numpy): |2c_n| = 0.099589, 0.098363, 0.063662, 0.005242, 0.004742 at n = 1, 2, 10, 19, 21.
    const ex = toothDropExcitation({ teeth: 20 });
    expect(ex.mean).toBeCloseTo(0.95, 12);
    const table: Array<[number, number]> = [[1, 0.099589], [2, 0.098363], [10, 0.063662], [19, 0.005242], [21, 0.004742]];
    for (const [n, amplitude] of table) {
      const line = lineAt(ex.lines, n)!;
      expect(line.coefficient.amplitude).toBeCloseTo(amplitude, 6);
      expect(line.harmonic).toBe(n);
    }
    // c_n < 0 for n < N_t: the drop is a loss, phase π
    expect(Math.abs(lineAt(ex.lines, 1)!.coefficient.phaseRad)).toBeCloseTo(Math.PI, 12);
    for (const k of [1, 2, 3]) expect(lineAt(ex.lines, 20 * k)).toBeUndefined();
    expect(ex.lines).toHaveLength(60 - 3);
    expect(ex.domain).toBe('spectrum');
    expect(ex.path).toBe('torsional');
  });

  it('scales with the depth of a partial drop (broken tooth) and keeps the sinc zeros', () => {
    // Linearity of the series: a drop of depth d is d times the missing-tooth drop (check-values.md §6 form).
    const Z = 23, d = 0.35;
    const ex = toothDropExcitation({ teeth: Z, depthFraction: d });
    expect(ex.mean).toBeCloseTo(1 - d / Z, 12);
    for (const l of ex.lines) expect(l.coefficient.re).toBeCloseTo(-2 * d * (1 / Z) * sinc(l.order! / Z), 12);
  });

  it('gives half-sine and triangular drops the transforms of the cosine and triangular pulses', () => {
    // Pulse transforms (Bracewell, The Fourier Transform and Its Applications, ch. 2 tables; from memory):
    //   d·cos(πt/L) on |t| < L/2  ->  d·(2L/π)·cos(πnL)/(1 − (2nL)²);   d·(1 − 2|t|/L)  ->  d·(L/2)·sinc²(nL/2)
    fc.assert(fc.property(fc.integer({ min: 3, max: 90 }), fc.double({ min: 0.05, max: 1, noNaN: true }), fc.double({ min: 0.3, max: 2.5, noNaN: true }),
      (Z, d, w) => {
        const L = w / Z;
        const hs = toothDropExcitation({ teeth: Z, depthFraction: d, shape: 'half-sine', widthPitches: w, harmonics: 2 * Z });
        const tri = toothDropExcitation({ teeth: Z, depthFraction: d, shape: 'triangular', widthPitches: w, harmonics: 2 * Z });
        for (const n of [1, 2, Z - 1, Z, Z + 1, 2 * Z]) {
          const x = 2 * n * L;
          const halfSine = Math.abs(1 - x * x) < 1e-9 ? -d * L / 2 : (-d * (2 * L / Math.PI) * Math.cos(Math.PI * n * L)) / (1 - x * x);
          const triangle = -d * (L / 2) * sinc((n * L) / 2) ** 2;
          expect(lineAt(hs.lines, n)?.coefficient.re ?? 0).toBeCloseTo(2 * halfSine, 10);
          expect(lineAt(tri.lines, n)?.coefficient.re ?? 0).toBeCloseTo(2 * triangle, 10);
        }
        expect(hs.mean).toBeCloseTo(1 - d * (2 * L / Math.PI), 12);
        expect(tri.mean).toBeCloseTo(1 - d * L / 2, 12);
      }), { numRuns: 40 });
  });

  it('adds the mesh ripple r·(1 − d/Z) at the mesh frequency when asked', () => {
    // r·cos(2πZθ) gated to (1 − d) over one pitch: c_Z = r/2 − d·r/(2Z) (elementary integral of cos² over the pitch).
    const ex = toothDropExcitation({ teeth: 18, rippleFraction: 0.2, depthFraction: 1 });
    expect(lineAt(ex.lines, 18)!.coefficient.amplitude).toBeCloseTo(0.2 * (1 - 1 / 18), 12);
  });

  it('agrees with fft.js on the sampled waveform of the template', () => {
    const ex = toothDropExcitation({ teeth: 12, shape: 'triangular', rippleFraction: 0.1, harmonics: 40 });
    const dft = sampledFourierSeries(sampleSegments(ex.segments!, 1 << 16), 40);
    for (let n = 1; n <= 40; n++) {
      expect(dft.terms[n - 1]!.amplitude).toBeCloseTo(ex.series!.terms[n - 1]!.amplitude, 4);
    }
  });

  it('rejects bad teeth, depth, width and shape with the parameter named', () => {
    expect(() => toothDropExcitation({ teeth: 0 })).toThrow(/teeth/);
    expect(() => toothDropExcitation({ teeth: 20, depthFraction: 0 })).toThrow(/depthFraction/);
    expect(() => toothDropExcitation({ teeth: 20, widthPitches: 21 })).toThrow(/widthPitches/);
    expect(() => toothDropExcitation({ teeth: 20, shape: 'square' as never })).toThrow(SignatureInputError);
  });
});

describe('gearEccentricityExcitation', () => {
  it('puts e at 1×, r at the mesh and e·r/2 at mesh ± 1×', () => {
    // (1 + e cos x)(1 + r cos Zx) = 1 + e cos x + r cos Zx + (er/2)[cos (Z+1)x + cos (Z−1)x] (product-to-sum identity).
    const ex = gearEccentricityExcitation({ teeth: 31, modulationFraction: 0.3, rippleFraction: 0.2 });
    expect(ex.lines.map((l) => l.order)).toEqual([1, 30, 31, 32]);
    expect(ex.lines.map((l) => l.coefficient.amplitude)).toEqual([expect.closeTo(0.3, 12), expect.closeTo(0.03, 12), expect.closeTo(0.2, 12), expect.closeTo(0.03, 12)]);
    expect(ex.lines.map((l) => l.sideband)).toEqual([1, -1, 0, 1]);
  });
});

describe('gearWearExcitation', () => {
  it('grows the 2nd and 3rd mesh harmonics by the wear fraction', () => {
    const ex = gearWearExcitation({ teeth: 25, rippleFraction: 0.1, wearFraction: 0.6 });
    expect(ex.lines.map((l) => l.order)).toEqual([25, 50, 75]);
    expect(ex.lines.map((l) => l.coefficient.amplitude)).toEqual([expect.closeTo(0.1, 12), expect.closeTo(0.06, 12), expect.closeTo(0.06, 12)]);
  });
});
