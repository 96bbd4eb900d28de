import { readFileSync } from 'node:fs';
import { loadMachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { faultCandidates } from './fault-candidates.js';
import { faultComponentKinds, faultKinds } from './fault-kinds.js';

const example = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));

describe('faultCandidates', () => {
  it('lists every pair the contract table allows for the example machine', () => {
    const c = faultCandidates(example);
    const count = (fault: string) => c.filter((x) => x.fault === fault).length;
    // 4 shafts, 1 rotor, 4 gears in 2 meshes, 2 bearings, 1 motor (fixtures/machines/aeration-mixer-2.json)
    expect(count('unbalance')).toBe(5);
    expect(count('misalignment')).toBe(4);
    expect(count('looseness')).toBe(4);
    expect(count('gear-missing-tooth')).toBe(4);
    expect(count('gear-broken-tooth')).toBe(4);
    expect(count('gear-eccentricity')).toBe(4);
    expect(count('gear-wear')).toBe(2);
    for (const b of ['bearing-outer-race', 'bearing-inner-race', 'bearing-rolling-element', 'bearing-cage']) expect(count(b)).toBe(2);
    expect(c.find((x) => x.fault === 'electrical')).toEqual({ fault: 'electrical', component: 'motor', componentKind: 'motor', shaft: 'motor' });
    expect(c.find((x) => x.component === 'impeller')).toEqual({ fault: 'unbalance', component: 'impeller', componentKind: 'rotor', shaft: 'output' });
    expect(c).toHaveLength(36);
  });

  it('gives each candidate a component kind the fault allows', () => {
    for (const x of faultCandidates(example)) expect(faultComponentKinds[x.fault]).toContain(x.componentKind);
    expect(new Set(faultCandidates(example).map((x) => x.fault))).toEqual(new Set(faultKinds));
  });
});
