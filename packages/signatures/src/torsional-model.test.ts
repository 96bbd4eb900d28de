import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModelInput } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { shaftTorsionalStiffnessNmPerRad } from './shaft-stiffness.js';
import { inertiaMagnification, inertiaReceptance, torsionalModel } from './torsional-model.js';

const machineText = readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8');
// scipy/numpy reference on physical angles with kinematic constraints, made by fixtures/signatures/geared_chain.py
const reference = JSON.parse(readFileSync(new URL('../../../fixtures/signatures/geared-chain.json', import.meta.url), 'utf8')) as {
  naturalFrequenciesHz: number[];
  receptance: Array<{ response: string; force: string; frequencyHz: number; re: number; im: number }>;
};

/** A motor driving a load through one gear pair: motor J1 on shaft a; wheel Jw and load JL on shaft b, linked by a 50 mm × 1 m shaft. */
function gearedPair(pinion: number, wheel: number, J1: number, Jw: number, JL: number): MachineModelInput {
  return {
    id: 'test-geared-pair',
    speed: { shaft: 'a', nominalRpm: 1500 },
    shafts: [{ id: 'a' }, { id: 'b' }],
    gearMeshes: [{ id: 'mesh', driver: { gear: 'pinion', shaft: 'a', teeth: pinion }, driven: { gear: 'wheel', shaft: 'b', teeth: wheel } }],
    torsional: {
      dampingRatio: 0.02,
      inertias: [{ id: 'motor', shaft: 'a', kgM2: J1 }, { id: 'wheel', shaft: 'b', kgM2: Jw }, { id: 'load', shaft: 'b', kgM2: JL }],
      links: [{ id: 'load-shaft', from: 'wheel', to: 'load', diameterMm: 50, lengthMm: 1000, shearModulusGPa: 79.3 }],
    },
  };
}

describe('torsionalModel', () => {
  it('refers a geared chain through the ratio squared: √(k·n²(J1e + J2e)/(J1e·J2e))', () => {
    // Common practice (geared systems referred to one shaft by n²); two-inertia closed form check-values.md §5.
    const model = loadMachineModel(JSON.stringify(gearedPair(20, 40, 1, 0.4, 2)));
    const tm = torsionalModel(model)!;
    const n = 20 / 40;
    const k = shaftTorsionalStiffnessNmPerRad({ diameterMm: 50, lengthMm: 1000 }) * n * n;
    const J1e = 1 + 0.4 * n * n, J2e = 2 * n * n;
    expect(tm.nodes.map((x) => x.inertiaKgM2)).toEqual([expect.closeTo(J1e, 12), expect.closeTo(J2e, 12)]);
    expect(tm.modes.rigidBodyModes).toBe(1);
    expect(tm.modes.naturalFrequenciesHz).toEqual([expect.closeTo(Math.sqrt((k * (J1e + J2e)) / (J1e * J2e)) / (2 * Math.PI), 9)]);
  });

  it('gives the same frequencies whichever shaft the chain is referred to', () => {
    const model = loadMachineModel(JSON.stringify(gearedPair(17, 53, 0.3, 0.05, 1.7)));
    const a = torsionalModel(model, { referredTo: 'a' })!;
    const b = torsionalModel(model, { referredTo: 'b' })!;
    expect(b.modes.naturalFrequenciesHz[0]).toBeCloseTo(a.modes.naturalFrequenciesHz[0]!, 9);
    expect(b.nodes[0]!.inertiaKgM2).toBeCloseTo(a.nodes[0]!.inertiaKgM2 * (53 / 17) ** 2, 9);
  });

  it('lumps the example machine into three bodies and matches the scipy constraint-transformation reference', () => {
    const tm = torsionalModel(loadMachineModel(machineText))!;
    expect(tm.nodes.map((n) => n.members)).toEqual([['motor-rotor', 'input-sheave'], ['pinion-1', 'wheel-1', 'pinion-2', 'wheel-2'], ['impeller']]);
    expect(tm.modes.rigidBodyModes).toBe(1);
    expect(tm.modes.naturalFrequenciesHz).toHaveLength(2);
    tm.modes.naturalFrequenciesHz.forEach((f, i) => expect(f).toBeCloseTo(reference.naturalFrequenciesHz[i + 1]!, 6));
    expect(tm.warnings).toEqual([]);
  });

  it('gives the physical receptances of the scipy reference between inertias on different shafts', () => {
    const tm = torsionalModel(loadMachineModel(machineText))!;
    for (const h of reference.receptance) {
      const ours = inertiaReceptance(tm, h.response, h.force, h.frequencyHz);
      const scale = Math.hypot(h.re, h.im);
      expect(Math.abs(ours.re - h.re)).toBeLessThan(1e-6 * scale);
      expect(Math.abs(ours.im - h.im)).toBeLessThan(1e-6 * scale);
    }
  });

  it('reports mode shapes as physical angles, largest ±1, the rigid mode turning every shaft by its speed ratio', () => {
    const tm = torsionalModel(loadMachineModel(machineText))!;
    const rigid = tm.modeShapes[0]!;
    expect(rigid.rigidBody).toBe(true);
    // rigid body: every inertia's angle is proportional to its shaft's speed (motor fastest)
    expect(rigid.shape['motor-rotor']).toBeCloseTo(1, 12);
    expect(rigid.shape['impeller']! / rigid.shape['wheel-2']!).toBeCloseTo(1, 9);
    expect(rigid.shape['wheel-1']! / rigid.shape['pinion-1']!).toBeCloseTo(18 / 67, 9);
  });

  it('turns a flexible belt into a spring referred by the driven speed squared and condenses a massless shaft', () => {
    // a belt of stiffness k_b (referred to its driven shaft) into a shaft that carries no inertia, then a rigid
    // mesh onward: the massless shaft moves with the wheel body, so the belt spring joins motor and load.
    const m: MachineModelInput = {
      id: 'test-belt-spring', speed: { shaft: 'm', nominalRpm: 1500 },
      shafts: [{ id: 'm' }, { id: 'i' }, { id: 'o' }],
      belts: [{ id: 'belt', driver: { shaft: 'm', pitchDiameterMm: 100 }, driven: { shaft: 'i', pitchDiameterMm: 200 } }],
      gearMeshes: [{ id: 'g', driver: { gear: 'p', shaft: 'i', teeth: 10 }, driven: { gear: 'w', shaft: 'o', teeth: 30 } }],
      torsional: {
        dampingRatio: 0.05,
        inertias: [{ id: 'rotor', shaft: 'm', kgM2: 0.5 }, { id: 'w', shaft: 'o', kgM2: 9 }],
        links: [],
        couplings: [{ element: 'belt', stiffnessNmPerRad: 4000 }],
      },
    };
    const tm = torsionalModel(loadMachineModel(JSON.stringify(m)))!;
    const n = 0.5; // driven shaft i over the reference m
    const J2 = 9 * (n / 3) ** 2;
    const k = 4000 * n * n;
    expect(tm.modes.naturalFrequenciesHz[0]).toBeCloseTo(Math.sqrt((k * (0.5 + J2)) / (0.5 * J2)) / (2 * Math.PI), 9);
    expect(tm.warnings.some((w) => w.includes("'i'"))).toBe(true);
  });

  it('condenses a massless shaft between two flexible couplings into springs in series', () => {
    // Springs in series k1·k2/(k1 + k2) (elementary); both referred by their driven speed squared.
    const m: MachineModelInput = {
      id: 'test-series', speed: { shaft: 'm', nominalRpm: 1500 },
      shafts: [{ id: 'm' }, { id: 'i' }, { id: 'o' }],
      belts: [{ id: 'belt', driver: { shaft: 'm', pitchDiameterMm: 100 }, driven: { shaft: 'i', pitchDiameterMm: 200 } }],
      gearMeshes: [{ id: 'g', driver: { gear: 'p', shaft: 'i', teeth: 10 }, driven: { gear: 'w', shaft: 'o', teeth: 30 } }],
      torsional: {
        dampingRatio: 0.05,
        inertias: [{ id: 'rotor', shaft: 'm', kgM2: 0.5 }, { id: 'w', shaft: 'o', kgM2: 9 }],
        links: [],
        couplings: [{ element: 'belt', stiffnessNmPerRad: 4000 }, { element: 'g', stiffnessNmPerRad: 2.5e5 }],
      },
    };
    const tm = torsionalModel(loadMachineModel(JSON.stringify(m)))!;
    const k1 = 4000 * 0.5 ** 2, k2 = 2.5e5 * (0.5 / 3) ** 2;
    const k = (k1 * k2) / (k1 + k2);
    const J2 = 9 * (0.5 / 3) ** 2;
    expect(tm.springs).toHaveLength(1);
    expect(tm.springs[0]!.stiffnessNmPerRad).toBeCloseTo(k, 9);
    expect(tm.modes.naturalFrequenciesHz[0]).toBeCloseTo(Math.sqrt((k * (0.5 + J2)) / (0.5 * J2)) / (2 * Math.PI), 9);
  });

  it('is null for a model without a torsional section', () => {
    const m = gearedPair(20, 40, 1, 1, 1);
    delete m.torsional;
    expect(torsionalModel(loadMachineModel(JSON.stringify(m)))).toBeNull();
  });
});

describe('inertiaMagnification', () => {
  it('is about 1 well below the first flexible mode and large at it', () => {
    const tm = torsionalModel(loadMachineModel(machineText))!;
    const f1 = tm.modes.naturalFrequenciesHz[0]!;
    expect(inertiaMagnification(tm, 'impeller', 'wheel-1', f1 / 50)).toBeCloseTo(1, 2);
    expect(inertiaMagnification(tm, 'impeller', 'wheel-1', f1)).toBeGreaterThan(5);
  });
});
