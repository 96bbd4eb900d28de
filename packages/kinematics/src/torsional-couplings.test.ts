import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assertMachineModel } from './loader.js';
import { resolveTorsionalCouplings } from './torsional-couplings.js';

const read = (name: string) => JSON.parse(readFileSync(new URL(`../../../fixtures/machines/${name}`, import.meta.url), 'utf8'));

describe('resolveTorsionalCouplings', () => {
  it('attaches gear meshes at the gear bodies and belts at the sheave, rigid by default', () => {
    const c = resolveTorsionalCouplings(assertMachineModel(read('aeration-mixer-2.json')));
    expect(c.map((x) => [x.element, x.driverInertia, x.drivenInertia, x.stiffnessNmPerRad])).toEqual([
      ['v-belt', 'motor-rotor', 'input-sheave', null],
      ['stage-1', 'pinion-1', 'wheel-1', null],
      ['stage-2', 'pinion-2', 'wheel-2', null],
    ]);
    expect(c[1]!.ratio).toBeCloseTo(18 / 67, 15);
  });

  it('uses what torsional.couplings says', () => {
    const c = resolveTorsionalCouplings(assertMachineModel(read('skelmere-id-fan-1.json')));
    expect(c).toEqual([expect.objectContaining({ element: 'fan-belts', driverInertia: 'motor-rotor', drivenInertia: 'fan-sheave', stiffnessNmPerRad: 16000 })]);
  });

  it('is empty for a model without a torsional section', () => {
    expect(resolveTorsionalCouplings(assertMachineModel(read('skelmere-aeration-blower-1.json')))).toEqual([]);
  });
});
