import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { MachineModel } from './machine-model.js';
import { MachineModelError } from './problem.js';
import { beltSpeedRatio, gearMeshSpeedRatio, shaftRatio, shaftRatios, shaftSpeeds, shaftSpeedsHz, speedEdges } from './shaft-speeds.js';
import { assertMachineModel } from './loader.js';

const example = assertMachineModel(JSON.parse(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8')));

describe('beltSpeedRatio', () => {
  it('is driver over driven pitch diameter, less the slip', () => {
    // Common practice: n2/n1 = D1/D2 × (1 − s). 180/250 × 0.99 = 0.7128.
    expect(beltSpeedRatio({ driver: { shaft: 'a', pitchDiameterMm: 180 }, driven: { shaft: 'b', pitchDiameterMm: 250 }, slipPercent: 1 })).toBeCloseTo(0.7128, 12);
    expect(beltSpeedRatio({ driver: { shaft: 'a', pitchDiameterMm: 200 }, driven: { shaft: 'b', pitchDiameterMm: 100 } })).toBe(2);
  });
});

describe('gearMeshSpeedRatio', () => {
  it('is driver teeth over driven teeth', () => {
    // Common practice: equal tooth-passing rate, N1·n1 = N2·n2.
    expect(gearMeshSpeedRatio({ driver: { gear: 'p', shaft: 'a', teeth: 18 }, driven: { gear: 'w', shaft: 'b', teeth: 67 } })).toBeCloseTo(18 / 67, 15);
  });
});

describe('shaftSpeeds', () => {
  it('carries the example machine from motor to output through belt and both stages', () => {
    // By hand: 1480 × 180/250 × 0.99 = 1054.944 rpm; × 18/67 = 283.418 rpm; × 23/79 = 82.514 rpm.
    const s = shaftSpeeds(example);
    expect(s.map((x) => x.shaft)).toEqual(['motor', 'input', 'intermediate', 'output']);
    expect(s[0]!.speedRpm).toBe(1480);
    expect(s[1]!.speedRpm).toBeCloseTo(1054.944, 9);
    expect(s[2]!.speedRpm).toBeCloseTo((1054.944 * 18) / 67, 9);
    expect(s[3]!.speedRpm).toBeCloseTo((((1054.944 * 18) / 67) * 23) / 79, 9);
    expect(s[3]!.speedHz).toBeCloseTo(s[3]!.speedRpm / 60, 12);
    expect(s[3]!.via).toEqual(['v-belt', 'stage-1', 'stage-2']);
  });

  it('scales every shaft with the reference speed given', () => {
    const a = shaftSpeeds(example, 1380);
    const b = shaftSpeeds(example);
    a.forEach((x, i) => expect(x.speedRpm / b[i]!.speedRpm).toBeCloseTo(1380 / 1480, 12));
  });

  it('refuses a reference speed that is not a positive number, naming it', () => {
    expect(() => shaftSpeeds(example, 0)).toThrow(/referenceSpeedRpm/);
    expect(() => shaftSpeedsHz(example, Number.NaN)).toThrow(/referenceSpeedHz/);
  });

  it('walks edges backwards when the reference shaft is a driven one', () => {
    const fromOutput: MachineModel = { ...example, speed: { shaft: 'output', nominalRpm: 82.514 } };
    const ratios = shaftRatios(fromOutput);
    const motor = ratios.find((r) => r.shaft === 'motor')!;
    expect(motor.ratio * 82.514).toBeCloseTo(1480, 2);
    expect(shaftRatio(fromOutput, 'output')).toBe(1);
  });

  it('throws MachineModelError for a disconnected model given without the validator', () => {
    const broken: MachineModel = { ...example, shafts: [...example.shafts, { id: 'spare' }] };
    expect(() => shaftRatios(broken)).toThrow(MachineModelError);
  });
});

describe('shaftSpeedsHz', () => {
  it('maps shaft ids to Hz', () => {
    const hz = shaftSpeedsHz(example, 1480 / 60);
    expect(hz.input).toBeCloseTo(1054.944 / 60, 9);
  });
});

/** Relative closeness: random trains reach ratios from 1e-12 to 1e12. */
function expectRelClose(actual: number, expected: number, tolerance = 1e-9): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance * Math.abs(expected));
}

/** A random tree of shafts joined by belts and gear meshes in random directions. */
const randomTrain = fc
  .array(
    fc.record({
      parent: fc.nat(),
      kind: fc.constantFrom('belt', 'gear-mesh'),
      forward: fc.boolean(),
      a: fc.integer({ min: 10, max: 120 }),
      b: fc.integer({ min: 10, max: 120 }),
      slipPercent: fc.double({ min: 0, max: 3, noNaN: true }),
    }),
    { minLength: 1, maxLength: 12 },
  )
  .chain((edges) => fc.tuple(fc.constant(edges), fc.nat({ max: edges.length })))
  .map(([edges, reference]) => {
    const model: MachineModel = {
      id: 'random', speed: { shaft: `s${reference}`, nominalRpm: 1000 }, shafts: [{ id: 's0' }],
      belts: [], gearMeshes: [], bearings: [], rotors: [], points: [],
    };
    edges.forEach((e, i) => {
      const child = `s${i + 1}`;
      const parent = `s${e.parent % (i + 1)}`;
      model.shafts.push({ id: child });
      const [driver, driven] = e.forward ? [parent, child] : [child, parent];
      if (e.kind === 'belt') {
        model.belts.push({ id: `e${i}`, driver: { shaft: driver, pitchDiameterMm: e.a * 2 }, driven: { shaft: driven, pitchDiameterMm: e.b * 2 }, slipPercent: e.slipPercent });
      } else {
        model.gearMeshes.push({ id: `e${i}`, driver: { gear: `g${i}a`, shaft: driver, teeth: e.a }, driven: { gear: `g${i}b`, shaft: driven, teeth: e.b } });
      }
    });
    return model;
  });

describe('shaftRatios (properties)', () => {
  it('satisfies every belt and mesh ratio along every edge, whichever shaft is the reference', () => {
    fc.assert(
      fc.property(randomTrain, (model) => {
        const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
        expect(ratio.get(model.speed.shaft)).toBe(1);
        for (const e of speedEdges(model)) {
          expectRelClose(ratio.get(e.drivenShaft)! / ratio.get(e.driverShaft)!, e.ratio);
        }
      }),
    );
  });

  it('gives ratios that differ only by a constant factor when the reference shaft changes', () => {
    fc.assert(
      fc.property(randomTrain, fc.nat(), (model, pick) => {
        const other = model.shafts[pick % model.shafts.length]!.id;
        const a = shaftRatios(model);
        const b = shaftRatios({ ...model, speed: { shaft: other, nominalRpm: 1 } });
        const k = a.find((r) => r.shaft === other)!.ratio;
        a.forEach((r, i) => expectRelClose(b[i]!.ratio * k, r.ratio));
      }),
    );
  });
});
