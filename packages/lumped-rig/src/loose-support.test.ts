import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { amplitudeNear, amplitudeSpectrum } from '../test-support/spectrum.js';
import { looseSupportAcceleration, supportForceN, type LooseSupportSpec } from './loose-support.js';
import { NO_IMPULSES } from './structural-path.js';

const M = 60;
const contactHz = 400;
const kc = M * (2 * Math.PI * contactHz) ** 2;
const spec = (holdingForceN: number, gapM = 1e-4): LooseSupportSpec => ({
  housingMassKg: M,
  contactStiffnessNPerM: kc,
  contactDampingNsPerM: 2 * 0.05 * Math.sqrt(kc * M),
  boltStiffnessNPerM: 3 * kc,
  boltDampingNsPerM: 2 * 0.05 * Math.sqrt(3 * kc * M),
  gapM,
  holdingForceN,
});

function run(holdingForceN: number, forceAmplitudeN: number, shaftHz: number, fs: number, seconds: number) {
  const n = Math.round(seconds * fs);
  const force = Float64Array.from({ length: n }, (_, k) => forceAmplitudeN * Math.cos((2 * Math.PI * shaftHz * k) / fs));
  return looseSupportAcceleration(force, 1 / fs, 0, spec(holdingForceN), NO_IMPULSES);
}

describe('looseSupportAcceleration', () => {
  it('stays a linear mount while the holding force exceeds the running force: the 1× response of an SDOF, no harmonics', () => {
    const fs = 20_000;
    const f = 30;
    const a = run(500, 100, f, fs, 4);
    const s = amplitudeSpectrum(a.subarray(fs), fs);
    const r = f / contactHz;
    const expected = (100 / M) * (r * r) / Math.sqrt((1 - r * r) ** 2 + (2 * 0.05 * r) ** 2);
    expect(Math.abs(amplitudeNear(s, f) / expected - 1)).toBeLessThan(0.02);
    for (const h of [2, 3, 4]) expect(amplitudeNear(s, h * f)).toBeLessThan(1e-3 * expected);
  });

  it('clips into many harmonics once the housing lifts off (force above the holding force)', () => {
    const fs = 20_000;
    const f = 30;
    const a = run(30, 100, f, fs, 4);
    const s = amplitudeSpectrum(a.subarray(fs), fs);
    const first = amplitudeNear(s, f);
    // A lifting, landing housing: several harmonics within 40 dB of 1× (common practice reads this as looseness).
    const strong = [2, 3, 4, 5, 6, 7, 8].filter((h) => amplitudeNear(s, h * f) > 0.01 * first);
    expect(strong.length).toBeGreaterThanOrEqual(5);
  });

  it('never pulls on the housing: the base and the bolt only push (property)', () => {
    const sp = spec(10);
    fc.assert(
      fc.property(fc.double({ min: -1e-3, max: 1e-3, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true }), (y, v) => {
        const f = supportForceN(sp, y, v);
        if (y < 0) expect(f).toBeLessThanOrEqual(0);
        else if (y > sp.gapM) expect(f).toBeGreaterThanOrEqual(0);
        else expect(f).toBe(0);
      }),
    );
  });

  it('names a bad parameter', () => {
    expect(() => looseSupportAcceleration(new Float64Array(4), 1e-4, 0, { ...spec(1), gapM: -1 }, NO_IMPULSES)).toThrow(/gapM/);
  });
});
