import { describe, expect, it } from 'vitest';
import { faultComponentKinds, faultKinds, isFaultKind } from './fault-kinds.js';

describe('faultKinds', () => {
  it('holds the twelve kinds of the contract table (machine-model.md), each once, with its component kinds', () => {
    expect(new Set(faultKinds).size).toBe(12);
    expect(Object.keys(faultComponentKinds).sort()).toEqual([...faultKinds].sort());
    // the table's "component is a" column, as the contract writes it
    expect(faultComponentKinds.unbalance).toEqual(['shaft', 'rotor']);
    expect(faultComponentKinds['gear-wear']).toEqual(['gear-mesh']);
    expect(faultComponentKinds.electrical).toEqual(['motor']);
  });
});

describe('isFaultKind', () => {
  it('accepts each listed kind and nothing else', () => {
    for (const kind of faultKinds) expect(isFaultKind(kind)).toBe(true);
    for (const other of ['rust', 'Unbalance', '', 3, null, undefined]) expect(isFaultKind(other)).toBe(false);
  });
});
