import { BandEnvelopes, bandPaving, noiseFloor } from '@kinespec/signal';
import { describe, expect, it } from 'vitest';
import { gaussianNoise, impactTrain } from '../../test/signals.js';
import { matchableSpectrum } from '../line-matching.js';
import { claimShared, searchCombs, type BandSource, type BearingComb } from './bearing-comb.js';

const FS = 20_000;
const N = 1 << 17; // 6.5 s
const SHAFT_HZ = 24.7;
// Defect orders of a 9-ball deep-groove bearing (the CWRU drive-end bearing's published orders, Smith & Randall 2015).
const BPFO = 3.5848 * SHAFT_HZ;
const BPFI = 5.4152 * SHAFT_HZ;

function sourceOf(x: Float64Array): BandSource {
  const bank = new BandEnvelopes(x, FS);
  const bands = bandPaving(FS, { minBandwidthHz: 3.5 * BPFO });
  const memo = new Map<string, ReturnType<typeof matchableSpectrum>>();
  return {
    bands,
    spectrumOf: (b) => {
      const key = `${b.lowHz}|${b.highHz}`;
      let m = memo.get(key);
      if (!m) {
        const s = bank.envelopeSpectrum(b, { resolutionHz: 0.4 });
        m = matchableSpectrum(s, noiseFloor(s));
        memo.set(key, m);
      }
      return m;
    },
  };
}

const combs: BearingComb[] = [
  { key: 'outer', defectHz: BPFO, rateLabel: 'BPFO', sidebandHz: null, sidebandLabel: null, modulationHz: [SHAFT_HZ], minBandwidthHz: 3.5 * BPFO },
  { key: 'inner', defectHz: BPFI, rateLabel: 'BPFI', sidebandHz: SHAFT_HZ, sidebandLabel: '1×', modulationHz: [SHAFT_HZ], minBandwidthHz: 3.5 * BPFI },
];
const options = { foreignRates: [{ rateHz: SHAFT_HZ, relativeUncertainty: 1e-4 }], speedUncertaintyFraction: 1e-4, slipFraction: 0.02, maxHarmonics: 10, minLineSnrDb: 3 };

describe('searchCombs', () => {
  // A localised defect: impacts at the defect rate with 1 % random slip, each ringing a 3.6 kHz resonance (the
  // textbook bearing-fault model, Randall & Antoni 2011 §2.1), 1.3 % faster than kinematics say, in noise.
  it('finds an outer-race comb 1.3 % off its kinematic rate, in the band of its resonance, far beyond chance', () => {
    const x = gaussianNoise(N, 11, 0.05);
    const impacts = impactTrain({ sampleRateHz: FS, length: N, rateHz: BPFO * 1.013, resonanceHz: 3600, dampingRatio: 0.05, amplitude: 1, jitterFraction: 0.01, seed: 3 });
    for (let i = 0; i < N; i++) x[i] += impacts[i]!;
    const [outer, inner] = claimShared(combs, searchCombs(combs, sourceOf(x), options));
    expect(outer!.chance).toBeLessThan(1e-6);
    expect(outer!.slip).toBeGreaterThan(1.008);
    expect(outer!.slip).toBeLessThan(1.018);
    expect(outer!.band!.lowHz).toBeLessThan(3600);
    expect(outer!.band!.highHz).toBeGreaterThan(3600);
    expect(inner!.chance).toBeGreaterThan(1e-2);
  });

  it('finds an inner-race comb with its shaft sidebands (load-zone modulation)', () => {
    const x = gaussianNoise(N, 12, 0.05);
    const impacts = impactTrain({
      sampleRateHz: FS, length: N, rateHz: BPFI, resonanceHz: 4200, dampingRatio: 0.04, amplitude: 1, jitterFraction: 0.01, seed: 5,
      modulation: (t) => 0.6 + 0.4 * Math.cos(2 * Math.PI * SHAFT_HZ * t),
    });
    for (let i = 0; i < N; i++) x[i] += impacts[i]!;
    const [outer, inner] = claimShared(combs, searchCombs(combs, sourceOf(x), options));
    expect(inner!.chance).toBeLessThan(1e-6);
    expect(inner!.lines.some((l) => l.sideband !== 0 && l.matched)).toBe(true);
    expect(outer!.chance).toBeGreaterThan(1e-2);
  });

  // The failure this module was written against: a once-per-revolution impact (a broken tooth, a rub) fills the
  // envelope with a dense comb of shaft harmonics, on which every line of a bearing pattern with shaft sidebands lands
  // at a coarse resolution. Lines on shaft harmonics are not the bearing's (they cannot be told apart).
  it('reads no bearing comb from a once-per-revolution impact train (a comb of shaft harmonics)', () => {
    const x = gaussianNoise(N, 13, 0.05);
    const impacts = impactTrain({ sampleRateHz: FS, length: N, rateHz: SHAFT_HZ, resonanceHz: 3000, dampingRatio: 0.03, amplitude: 2, seed: 9 });
    for (let i = 0; i < N; i++) x[i] += impacts[i]!;
    for (const e of claimShared(combs, searchCombs(combs, sourceOf(x), options))) expect(e.chance).toBeGreaterThan(1e-3);
  });

  it('finds nothing in noise alone', () => {
    for (const e of searchCombs(combs, sourceOf(gaussianNoise(N, 14, 0.05)), options)) expect(e.chance).toBeGreaterThan(1e-2);
  });
});

describe('claimShared', () => {
  it('leaves a weaker comb none of the lines a stronger one explains (one peak, one explanation)', () => {
    const x = gaussianNoise(N, 15, 0.05);
    const impacts = impactTrain({ sampleRateHz: FS, length: N, rateHz: BPFO, resonanceHz: 3600, dampingRatio: 0.05, amplitude: 1, jitterFraction: 0.005, seed: 4 });
    for (let i = 0; i < N; i++) x[i] += impacts[i]!;
    // A comb at half the outer-race rate: every other harmonic of it is an outer-race line.
    const half: BearingComb = { key: 'half', defectHz: BPFO / 2, rateLabel: 'H', sidebandHz: null, sidebandLabel: null, modulationHz: [], minBandwidthHz: 3.5 * BPFO / 2 };
    const [outer, h] = claimShared([combs[0]!, half], searchCombs([combs[0]!, half], sourceOf(x), options));
    expect(outer!.chance).toBeLessThan(1e-6);
    expect(h!.lines.filter((l) => l.claimedBy === 'outer').length).toBeGreaterThan(0);
    expect(h!.chance).toBeGreaterThan(1e-3);
  });
});
