import { readFileSync } from 'node:fs';
import { assertMachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, sine } from '../test/signals.js';
import { analyseRecording } from './analyse-recording.js';
import { pathShape, type JudgedLine } from './hypotheses.js';

const fan = assertMachineModel(JSON.parse(readFileSync(new URL('../../../fixtures/machines/skelmere-id-fan-1.json', import.meta.url), 'utf8')));
const FS = 5120;
const N = 5120 * 16;
const MOTOR_HZ = 1470 / 60;

/** A velocity recording (mm/s) at the fan's motor point made of the given tones (Hz, peak mm/s) and a little noise. */
function motorPoint(tones: Array<[number, number]>) {
  const x = add(gaussianNoise(N, 21, 0.01), ...tones.map(([f, a], i) => sine(N, FS, f, a, i)));
  return { sampleRateHz: FS, channels: [{ name: 'motor-de-h', unit: 'mm/s', samples: x }], metadata: {} };
}

const score = (a: ReturnType<typeof analyseRecording>, fault: string, component: string) =>
  a.hypotheses.find((h) => h.fault === fault && h.component === component)?.score ?? 0;

// Patterns from common practice (docs/machine-model.md fault table): unbalance a dominant 1×; misalignment 1× with a
// 2× at least half as large (in velocity), often 3×. Levels: ISO 20816-3, this fan is group 2 on a flexible foundation.
describe('fault patterns of a shaft', () => {
  it('does not call a lone sine unbalance: with no other running line, nothing says it is the shaft’s 1×', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 9]]), { model: fan, pointId: 'motor-de-h' });
    expect(score(a, 'unbalance', 'motor')).toBeLessThan(0.5);
    expect(score(a, 'misalignment', 'motor')).toBeLessThan(0.5);
    expect(a.hypotheses.find((h) => h.fault === 'unbalance' && h.component === 'motor')!.parts.gateReasons?.[0]).toMatch(/rests on this one line/);
  });

  it('calls a dominant 1× unbalance when the speed is given and agrees', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 9], [2 * MOTOR_HZ, 0.6]]), { model: fan, pointId: 'motor-de-h', speedRpm: 1470 });
    expect(score(a, 'unbalance', 'motor')).toBeGreaterThanOrEqual(0.5);
    expect(score(a, 'misalignment', 'motor')).toBeLessThan(0.5);
  });

  it('calls 1× with a 2× as large misalignment, not unbalance', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 5], [2 * MOTOR_HZ, 6], [3 * MOTOR_HZ, 1.5]]), { model: fan, pointId: 'motor-de-h', speedRpm: 1470 });
    expect(score(a, 'misalignment', 'motor')).toBeGreaterThanOrEqual(0.5);
    expect(score(a, 'misalignment', 'motor')).toBeGreaterThan(score(a, 'unbalance', 'motor'));
  });

  it('does not call misalignment without a 2× line (a lone 1× is no misalignment)', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 9], [3 * MOTOR_HZ, 1]]), { model: fan, pointId: 'motor-de-h', speedRpm: 1470 });
    expect(score(a, 'misalignment', 'motor')).toBeLessThan(0.5);
  });

  it('judges levels from the ISO A/B boundary (nothing) to B/C (all): a 1× of a new machine is no fault', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 1.5], [2 * MOTOR_HZ, 0.2]]), { model: fan, pointId: 'motor-de-h', speedRpm: 1470 });
    expect(score(a, 'unbalance', 'motor')).toBeLessThan(0.5);
  });
});

describe('one physical part, one report', () => {
  const ims = assertMachineModel({
    id: 'four-bearing-shaft', name: 'four identical bearings on one shaft', speed: { shaft: 's', nominalRpm: 2000, minRpm: 1900, maxRpm: 2100 },
    shafts: [{ id: 's' }],
    bearings: ['b1', 'b2', 'b3', 'b4'].map((id) => ({ id, shaft: 's', rollingElements: 16, rollingElementDiameterMm: 8.4, pitchDiameterMm: 71.5, contactAngleDeg: 15 })),
    points: [{ id: 'p3', near: 'b3', direction: 'radial', quantity: 'acceleration', unit: 'g' }],
    iso: { group: 2, foundation: 'rigid' },
  });

  it('names identical bearings on one shaft together, after the one the point is near', () => {
    const x = gaussianNoise(20_000, 4, 0.1);
    const a = analyseRecording({ sampleRateHz: 20_000, channels: [{ name: 'p3', unit: 'g', samples: x }], metadata: {} }, { model: ims, pointId: 'p3', speedRpm: 2000 });
    const outer = a.hypotheses.filter((h) => h.fault === 'bearing-outer-race');
    expect(outer.map((h) => h.component)).toEqual(['b3']);
    expect(outer[0]!.twins).toEqual(['b1', 'b2', 'b4']);
  });

  it('reports the unbalance of a shaft that carries one rotor once, as the rotor’s', () => {
    const a = analyseRecording(motorPoint([[MOTOR_HZ, 2]]), { model: fan, pointId: 'motor-de-h', speedRpm: 1470 });
    const unbalance = a.hypotheses.filter((h) => h.fault === 'unbalance').map((h) => h.component).sort();
    expect(unbalance).toEqual(['fan-wheel', 'motor']);
    expect(a.hypotheses.find((h) => h.component === 'fan-wheel' && h.fault === 'unbalance')!.twins).toContain('fan');
  });
});

describe('pathShape', () => {
  const line = (f: number, predicted: number, measured: number): JudgedLine => ({
    label: `${f}`, predictedHz: f, predictedAmplitude: predicted, toleranceHz: 1, measuredHz: f, measuredAmplitude: measured, snrDb: 20,
    chance: 0.01, matched: true, counted: true, ambiguous: false, ambiguousWith: [], running: false, twin: false, synchronous: false, harmonic: 1, sidebandOrder: null,
  });

  it('forgives an unknown path that tilts and bows the spectrum smoothly (a quadratic in log frequency)', () => {
    const lines = [100, 150, 200, 300, 400, 600, 800].map((f) => line(f, 1, Math.exp(0.5 + 1.2 * Math.log(f / 100) - 0.4 * Math.log(f / 100) ** 2)));
    expect(pathShape(lines)).toBeCloseTo(1, 9);
  });

  it('is lowered by scatter the path cannot explain: ±10 dB alternating gives exp(−½)', () => {
    const lines = [100, 150, 200, 300, 400, 600, 800, 1000].map((f, i) => line(f, 1, 10 ** ((i % 2 === 0 ? 10 : -10) / 20)));
    expect(pathShape(lines)).toBeGreaterThan(0.5);
    expect(pathShape(lines)).toBeLessThan(0.7);
  });

  it('says nothing with fewer than six found lines', () => {
    expect(pathShape([100, 200, 300].map((f) => line(f, 1, f)))).toBe(1);
  });
});
