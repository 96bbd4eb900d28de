import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SignatureInputError } from './errors.js';
import {
  fourierSeries, meanSquare, partialSum, partialSumWaveform, sampleSegments, sampledFourierSeries,
  seriesMeanSquare, validateSegments, type Segment,
} from './fourier-series.js';

// numpy's sinc convention: sin(πx)/(πx)
const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
const c = (s: ReturnType<typeof fourierSeries>, n: number) => (n === 0 ? { re: s.a0, im: 0 } : { re: s.terms[n - 1]!.a / 2, im: -s.terms[n - 1]!.b / 2 });

describe('fourierSeries', () => {
  it('gives the duty-0.25 rectangular pulse train coefficients of the closed form', () => {
    // Closed form c_n = (Aτ/T)·sinc(nτ/T): Oppenheim & Willsky, Signals and Systems, 2nd ed., Ex. 3.5 (from memory);
    // values from check-values.md §6 (numpy, FFT-checked).
    const s = fourierSeries([{ kind: 'constant', startFraction: -0.125, endFraction: 0.125, value: 1 }], 8);
    const expected = [0.25, 0.225079, 0.159155, 0.075026, 0, -0.045016, -0.053052, -0.032154];
    expected.forEach((v, n) => {
      expect(c(s, n).re).toBeCloseTo(v, 6);
      expect(c(s, n).im).toBeCloseTo(0, 12);
    });
  });

  it('matches (Aτ/T)·sinc(nτ/T) for any height and width up to harmonic 60', () => {
    // Oppenheim & Willsky, Ex. 3.5 (from memory), shifted pulses get the phase e^{−j2πnθ0} (shift theorem).
    const A = 2.5, tau = 0.3, shift = 0.2;
    const s = fourierSeries([{ kind: 'constant', startFraction: shift - tau / 2, endFraction: shift + tau / 2, value: A }], 60);
    for (let n = 1; n <= 60; n++) {
      const mag = A * tau * sinc(n * tau);
      expect(c(s, n).re).toBeCloseTo(mag * Math.cos(-2 * Math.PI * n * shift), 12);
      expect(c(s, n).im).toBeCloseTo(mag * Math.sin(-2 * Math.PI * n * shift), 12);
    }
  });

  it('reproduces the missing-tooth pulse model of check-values §6 (N_t = 20, τ = 0.5/N_t)', () => {
    // 20 pulses per revolution of width τ, pulse 0 absent: c_n = τ·sinc(nτ)·(N_t·[n ≡ 0 mod N_t] − 1), check-values.md §6.
    const Nt = 20, tau = 0.5 / Nt;
    const segments: Segment[] = [];
    for (let k = 1; k < Nt; k++) segments.push({ kind: 'constant', startFraction: k / Nt - tau / 2, endFraction: k / Nt + tau / 2, value: 1 });
    const s = fourierSeries(segments, 40);
    const table: Array<[number, number]> = [[0, 0.475], [1, -0.024974], [2, -0.024897], [10, -0.022508], [19, -0.016702], [20, 0.302394], [21, -0.015111], [40, 0]];
    for (const [n, v] of table) {
      expect(c(s, n).re).toBeCloseTo(v, 6);
      expect(Math.abs(c(s, n).im)).toBeLessThan(1e-12);
    }
    for (let n = 0; n <= 40; n++) {
      expect(c(s, n).re).toBeCloseTo(tau * sinc(n * tau) * ((n % Nt === 0 ? Nt : 0) - 1), 12);
    }
  });

  it('gives b_n = 4/(nπ) on odd n and nothing on even n for a ±1 square wave', () => {
    // Square wave ±1: b_n = 4/(nπ), odd n only (check-values.md §6; standard Fourier series).
    const s = fourierSeries(squareWave, 25);
    expect(s.a0).toBeCloseTo(0, 14);
    for (const t of s.terms) {
      expect(t.a).toBeCloseTo(0, 12);
      expect(t.b).toBeCloseTo(t.harmonic % 2 === 1 ? 4 / (t.harmonic * Math.PI) : 0, 12);
    }
  });

  it('gives the sawtooth and triangle-wave series of the tables from linear segments', () => {
    // Sawtooth f = θ on [0,1): a0 = 1/2, b_n = −1/(πn). Triangle of peak ±1: a_n = 8/(π²n²), odd n.
    // Standard series (e.g. Kreyszig, Advanced Engineering Mathematics, §11.1 examples; from memory).
    const saw = fourierSeries([{ kind: 'linear', startFraction: 0, endFraction: 1, startValue: 0, endValue: 1 }], 30);
    expect(saw.a0).toBeCloseTo(0.5, 14);
    for (const t of saw.terms) {
      expect(t.a).toBeCloseTo(0, 12);
      expect(t.b).toBeCloseTo(-1 / (Math.PI * t.harmonic), 12);
    }
    const tri = fourierSeries([
      { kind: 'linear', startFraction: -0.5, endFraction: 0, startValue: -1, endValue: 1 },
      { kind: 'linear', startFraction: 0, endFraction: 0.5, startValue: 1, endValue: -1 },
    ], 30);
    for (const t of tri.terms) {
      expect(t.a).toBeCloseTo(t.harmonic % 2 === 1 ? 8 / (Math.PI ** 2 * t.harmonic ** 2) : 0, 12);
      expect(t.b).toBeCloseTo(0, 12);
    }
  });

  it('gives a periodic decaying exponential the coefficients (1 − e^{−λ})/(λ + j2πn)', () => {
    // ∫_0^1 e^{−λθ}e^{−j2πnθ}dθ = (1 − e^{−λ})/(λ + j2πn): elementary integral (any table of integrals).
    const lambda = 7.5;
    const s = fourierSeries([{ kind: 'exponential', startFraction: 0, endFraction: 1, startValue: 1, decayPerPeriod: lambda }], 20);
    for (let n = 0; n <= 20; n++) {
      const num = 1 - Math.exp(-lambda);
      const d = lambda * lambda + (2 * Math.PI * n) ** 2;
      expect(c(s, n).re).toBeCloseTo((num * lambda) / d, 12);
      expect(c(s, n).im).toBeCloseTo((-num * 2 * Math.PI * n) / d, 12);
    }
  });

  it('puts a cosine segment spanning the period at its own harmonic with its amplitude and phase', () => {
    // A·cos(2πmθ + φ) over a whole period is its own series: A_m = A, φ_m = φ (definition of the series).
    const s = fourierSeries([{ kind: 'cosine', startFraction: 0, endFraction: 1, amplitude: 0.7, cyclesPerPeriod: 5, phaseRad: 0.9, offset: 2 }], 8);
    expect(s.a0).toBeCloseTo(2, 12);
    for (const t of s.terms) expect(t.amplitude).toBeCloseTo(t.harmonic === 5 ? 0.7 : 0, 12);
    expect(s.terms[4]!.phaseRad).toBeCloseTo(0.9, 12);
  });
});

describe('partialSumWaveform', () => {
  it('overshoots a jump by 0.091164, 0.089507 and 0.089490 of it at 9, 99 and 999 harmonics (Gibbs)', () => {
    // Gibbs overshoot (1/π)Si(π) − 1/2 = 0.0894898722 of the jump; partial-sum values from check-values.md §6
    // (numpy); Gibbs, Nature 59:200 (1898); Hewitt & Hewitt, Arch. Hist. Exact Sci. 21:129 (1979) (from memory).
    const s = fourierSeries(squareWave, 999);
    // [harmonics, peak of the partial sum, overshoot/jump], check-values.md §6 (out_mech.txt)
    const expected: Array<[number, number, number]> = [[9, 1.182328, 0.091164], [99, 1.179013, 0.089507], [999, 1.17898, 0.08949]];
    for (const [N, peak, overshoot] of expected) {
      // the first peak of the partial sum sits near θ = 1/(2(N+1)); search a fine grid around it
      const w = partialSumWaveform(s, { harmonics: N, points: 4000, startFraction: 0, spanFraction: 3 / (N + 1) });
      const max = Math.max(...w.value);
      expect(max).toBeCloseTo(peak, 6);
      expect(Math.abs((max - 1) / 2 - overshoot)).toBeLessThan(1e-6); // the table rounds both to 6 decimals
    }
  });

  it('tends to (1/π)Si(π) − 1/2 = 0.0894899 of the jump', () => {
    // Si(π) = 1.8519370520 (check-values.md §6, scipy.special.sici).
    const s = fourierSeries(squareWave, 20001);
    const N = 20001;
    const w = partialSumWaveform(s, { harmonics: N, points: 400, spanFraction: 2 / (N + 1) });
    expect((Math.max(...w.value) - 1) / 2).toBeCloseTo(1.851937052 / Math.PI - 0.5, 5);
  });

  it('agrees with partialSum point by point', () => {
    const s = fourierSeries(squareWave, 15);
    const w = partialSumWaveform(s, { harmonics: 15, points: 64 });
    for (let i = 0; i < 64; i += 7) expect(w.value[i]).toBeCloseTo(partialSum(s, 15, i / 64), 12);
  });

  it('rejects more harmonics than the series holds', () => {
    const s = fourierSeries(squareWave, 3);
    expect(() => partialSumWaveform(s, { harmonics: 4, points: 10 })).toThrow(SignatureInputError);
  });
});

const squareWave: Segment[] = [
  { kind: 'constant', startFraction: 0, endFraction: 0.5, value: 1 },
  { kind: 'constant', startFraction: 0.5, endFraction: 1, value: -1 },
];

/** Random contiguous constant/linear segments covering [0, 1). */
const piecewiseLinear = (continuous: boolean, maxSegments: number, maxValue: number) =>
  fc.record({
    cuts: fc.uniqueArray(fc.double({ min: 0.01, max: 0.99, noNaN: true }), { minLength: 0, maxLength: maxSegments - 1 }),
    values: fc.array(fc.double({ min: -maxValue, max: maxValue, noNaN: true }), { minLength: 2 * maxSegments, maxLength: 2 * maxSegments }),
    linear: fc.array(fc.boolean(), { minLength: maxSegments, maxLength: maxSegments }),
  }).map(({ cuts, values, linear }) => {
    // Drop cuts closer than 1e-6 to the previous edge before numbering the nodes, so that a skipped
    // sliver can never break the shared node values of a continuous polygon.
    const edges = [0];
    for (const c of [...cuts].sort((a, b) => a - b)) if (c - edges[edges.length - 1]! >= 1e-6 && 1 - c >= 1e-6) edges.push(c);
    edges.push(1);
    const segments: Segment[] = [];
    for (let i = 0; i + 1 < edges.length; i++) {
      const [startFraction, endFraction] = [edges[i]!, edges[i + 1]!];
      if (continuous) {
        // a closed polygon: node values shared by neighbours, the last node equal to the first
        const v0 = values[i]!;
        const v1 = i + 2 === edges.length ? values[0]! : values[i + 1]!;
        segments.push({ kind: 'linear', startFraction, endFraction, startValue: v0, endValue: v1 });
      } else if (linear[i]) {
        segments.push({ kind: 'linear', startFraction, endFraction, startValue: values[2 * i]!, endValue: values[2 * i + 1]! });
      } else {
        segments.push({ kind: 'constant', startFraction, endFraction, value: values[2 * i]! });
      }
    }
    return segments;
  });

const ends = (s: Segment): [number, number] =>
  s.kind === 'constant' ? [s.value, s.value] : s.kind === 'linear' ? [s.startValue, s.endValue] : [NaN, NaN];
const slope = (s: Segment) => (s.kind === 'linear' ? (s.endValue - s.startValue) / (s.endFraction - s.startFraction) : 0);

/** Total variation over one period (wrap-around jump included). */
function totalVariation(segments: Segment[]): number {
  let v = 0;
  segments.forEach((s, i) => {
    const [a, b] = ends(s);
    const [next] = ends(segments[(i + 1) % segments.length]!);
    v += Math.abs(b - a) + Math.abs(next - b);
  });
  return v;
}

describe('sampleSegments', () => {
  it('evaluates each segment kind exactly, sums overlapping layers and wraps the window', () => {
    // Hand-computed: a mean of 1 over [−0.25, 0.75), a ramp 0 → 2 over [0, 0.5) on top, a cosine layer
    // 0.5·cos(2π·2θ) over [0.5, 0.75) and e^{−4(θ − 0.5)} over [0.5, 0.75) as well.
    const segments: Segment[] = [
      { kind: 'constant', startFraction: -0.25, endFraction: 0.75, value: 1 },
      { kind: 'linear', startFraction: 0, endFraction: 0.5, startValue: 0, endValue: 2 },
      { kind: 'cosine', startFraction: 0.5, endFraction: 0.75, amplitude: 0.5, cyclesPerPeriod: 2, phaseRad: 0 },
      { kind: 'exponential', startFraction: 0.5, endFraction: 0.75, startValue: 1, decayPerPeriod: 4 },
    ];
    const y = sampleSegments(segments, 8); // θ = −0.25, −0.125, 0, 0.125, …, 0.625
    const expected = [
      1, 1, // the mean alone before the ramp
      1, 1 + 0.5, 1 + 1, 1 + 1.5, // ramp 4θ on [0, 0.5), end excluded
      1 + 0.5 * Math.cos(2 * Math.PI * 2 * 0.5) + 1, // θ = 0.5: cos(2π) = 1, e^0 = 1
      1 + 0.5 * Math.cos(2 * Math.PI * 2 * 0.625) + Math.exp(-4 * 0.125), // cos(2.5π) = 0
    ];
    expected.forEach((v, i) => expect(y[i]!, `sample ${i}`).toBeCloseTo(v, 12));
  });

  it('rejects a count that is not a whole number >= 1', () => {
    const segments: Segment[] = [{ kind: 'constant', startFraction: 0, endFraction: 1, value: 1 }];
    expect(() => sampleSegments(segments, 0)).toThrow(/count \(0\)/);
    expect(() => sampleSegments(segments, 2.5)).toThrow(SignatureInputError);
  });
});

describe('sampledFourierSeries', () => {
  it('agrees with the closed form for random continuous piecewise-linear excitations (aliasing bound)', () => {
    // For continuous f with f' of variation V', |c_k| <= V'/(4π²k²) (two integrations by parts), and the DFT
    // of N samples is Σ_m c_{n+mN} (aliasing); so the two differ by at most V'·(π²/3)/(4π²(N−n)²) per c_n.
    const N = 4096, H = 24;
    fc.assert(fc.property(piecewiseLinear(true, 8, 5), (segments) => {
      const exact = fourierSeries(segments, H);
      const dft = sampledFourierSeries(sampleSegments(segments, N), H);
      let vPrime = 0;
      segments.forEach((s, i) => { vPrime += Math.abs(slope(segments[(i + 1) % segments.length]!) - slope(s)); });
      const tol = (2 * vPrime) / (12 * (N - H) ** 2) + 1e-11;
      expect(Math.abs(dft.a0 - exact.a0)).toBeLessThanOrEqual(tol);
      for (let n = 0; n < H; n++) {
        expect(Math.abs(dft.terms[n]!.a - exact.terms[n]!.a)).toBeLessThanOrEqual(tol);
        expect(Math.abs(dft.terms[n]!.b - exact.terms[n]!.b)).toBeLessThanOrEqual(tol);
      }
    }), { numRuns: 60 });
  });

  it('agrees with the closed form for random excitations with jumps (rectangle-rule bound)', () => {
    // The DFT is the left-endpoint rule for c_n = ∫f·e^{−j2πnθ}; its error is at most V(g)/N for g of total
    // variation V(g) <= V(f) + 2πn·max|f| (Koksma's inequality in one dimension).
    const N = 65536, H = 8, maxValue = 1;
    fc.assert(fc.property(piecewiseLinear(false, 5, maxValue), (segments) => {
      const exact = fourierSeries(segments, H);
      const dft = sampledFourierSeries(sampleSegments(segments, N), H);
      const V = totalVariation(segments);
      for (let n = 1; n <= H; n++) {
        const tol = (2 * (V + 2 * Math.PI * n * maxValue)) / N;
        expect(Math.abs(dft.terms[n - 1]!.a - exact.terms[n - 1]!.a)).toBeLessThanOrEqual(tol);
        expect(Math.abs(dft.terms[n - 1]!.b - exact.terms[n - 1]!.b)).toBeLessThanOrEqual(tol);
      }
    }), { numRuns: 40 });
  });

  it('gives a sampled cosine its amplitude and phase (fft.js sign convention)', () => {
    const N = 256;
    const x = Array.from({ length: N }, (_, i) => 3 + 1.5 * Math.cos((2 * Math.PI * 7 * i) / N - 0.4));
    const s = sampledFourierSeries(x, 20);
    expect(s.a0).toBeCloseTo(3, 12);
    expect(s.terms[6]!.amplitude).toBeCloseTo(1.5, 12);
    expect(s.terms[6]!.phaseRad).toBeCloseTo(-0.4, 12);
  });

  it('rejects a length that is not a power of two, too many harmonics and non-finite samples', () => {
    expect(() => sampledFourierSeries(new Float64Array(100), 4)).toThrow(/power of two/);
    expect(() => sampledFourierSeries(new Float64Array(64), 32)).toThrow(/below samples.length\/2/);
    expect(() => sampledFourierSeries([0, NaN, 0, 0], 1)).toThrow(/samples\[1\]/);
  });
});

describe('meanSquare', () => {
  it('equals the series power within the Parseval tail bound for random piecewise-linear excitations', () => {
    // Parseval: ∫f² = Σ|c_n|²; with |c_n| <= V/(2π|n|) the tail beyond N is at most V²/(2π²N).
    const N = 1500;
    fc.assert(fc.property(piecewiseLinear(false, 6, 3), (segments) => {
      const gap = meanSquare(segments) - seriesMeanSquare(fourierSeries(segments, N));
      const V = totalVariation(segments);
      expect(gap).toBeGreaterThanOrEqual(-1e-9);
      expect(gap).toBeLessThanOrEqual((V * V) / (2 * Math.PI ** 2 * N) + 1e-9);
    }), { numRuns: 30 });
  });

  it('gives a cosine segment over a whole period o² + A²/2', () => {
    // Mean square of o + A cos: o² + A²/2 (Parseval; elementary).
    expect(meanSquare([{ kind: 'cosine', startFraction: 0, endFraction: 1, amplitude: 2, cyclesPerPeriod: 3, phaseRad: 1, offset: 0.5 }])).toBeCloseTo(0.25 + 2, 12);
  });
});

describe('validateSegments', () => {
  it('names the offending segment and field', () => {
    expect(() => validateSegments([{ kind: 'constant', startFraction: 0.5, endFraction: 0.2, value: 1 }])).toThrow(/segments\[0\]: endFraction/);
    expect(() => validateSegments([{ kind: 'constant', startFraction: 0, endFraction: 0.2, value: Infinity }])).toThrow(/segments\[0\]\.value/);
    expect(() => validateSegments([
      { kind: 'constant', startFraction: 0, endFraction: 0.6, value: 1 },
      { kind: 'constant', startFraction: 0.6, endFraction: 1.3, value: 1 },
    ])).toThrow(/fit in one period/);
    expect(() => validateSegments([{ kind: 'parabola', startFraction: 0, endFraction: 1 } as unknown as Segment])).toThrow(/kind/);
    expect(() => validateSegments([])).toThrow(/non-empty/);
  });

  it('throws the typed error with a stable code', () => {
    try {
      fourierSeries(squareWave, -1);
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(SignatureInputError);
      expect((err as SignatureInputError).code).toBe('invalid_harmonics');
    }
  });
});
