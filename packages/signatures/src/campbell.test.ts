import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModelInput } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { campbellData } from './campbell.js';

const example = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8'));
// scipy constraint-transformation reference, fixtures/signatures/geared_chain.py
const reference = JSON.parse(readFileSync(new URL('../../../fixtures/signatures/geared-chain.json', import.meta.url), 'utf8')) as { naturalFrequenciesHz: number[] };

function twoDiscs(range?: { minRpm: number; maxRpm: number }): MachineModelInput {
  return {
    id: 'test-two-discs', speed: { shaft: 's', nominalRpm: 3000, ...range }, shafts: [{ id: 's' }],
    torsional: {
      dampingRatio: 0.02,
      inertias: [{ id: 'j1', shaft: 's', kgM2: 1 }, { id: 'j2', shaft: 's', kgM2: 0.5 }],
      links: [{ id: 'k', from: 'j1', to: 'j2', diameterMm: 50, lengthMm: 1000, shearModulusGPa: 79.3 }],
    },
  };
}

describe('campbellData', () => {
  it('crosses order 1 with the two-disc frequency 60.8075 Hz at 3648.45 rpm and leaves order 20 out of range', () => {
    // f_n = √(k(J1+J2)/(J1J2)) = 60.8075 Hz (check-values.md §5); crossing speed = 60·f_n/order.
    const c = campbellData(loadMachineModel(JSON.stringify(twoDiscs({ minRpm: 600, maxRpm: 6000 }))), { orders: [1, { order: 20, label: 'mesh' }] });
    expect(c.naturalFrequencies).toEqual([expect.objectContaining({ frequencyHz: expect.closeTo(60.8075, 4), source: 'torsional' })]);
    expect(c.crossings).toHaveLength(1);
    expect(c.crossings[0]!.speedRpm).toBeCloseTo(60 * 60.8075, 1);
    expect(c.crossings[0]!.order).toBe(1);
    expect(c.crossings[0]!.nearNominal).toBe(false);
    expect(c.orders[1]!.frequencyHzAtMax).toBeCloseTo(2000, 9);
  });

  it('spans 0..1.25 × nominal when the model gives no speed range, and flags crossings within 10 % of nominal', () => {
    // 1× at 3000 rpm = 50 Hz; 60.8 Hz is crossed at 3648 rpm, 21.6 % above nominal: not near; order 1.15 crosses at 3172 rpm: near.
    const c = campbellData(loadMachineModel(JSON.stringify(twoDiscs())), { orders: [1, 1.15] });
    expect(c.speedRangeRpm).toEqual({ minRpm: 0, maxRpm: 3750 });
    expect(c.crossings.map((x) => x.nearNominal)).toEqual([true, false]);
  });

  it('lists the example machine\'s torsional modes and point resonance against its default orders', () => {
    const c = campbellData(example);
    expect(c.speedRangeRpm).toEqual({ minRpm: 1380, maxRpm: 1500 });
    const torsional = c.naturalFrequencies.filter((n) => n.source === 'torsional').map((n) => n.frequencyHz);
    expect(torsional).toEqual(reference.naturalFrequenciesHz.slice(1).map((f) => expect.closeTo(f, 6)));
    expect(c.naturalFrequencies.some((n) => n.source === 'structural' && n.frequencyHz === 3400)).toBe(true);
    // 1× motor is order 1; the 2 × 50 Hz electrical line does not follow speed
    expect(c.orders.some((o) => o.order === 1)).toBe(true);
    expect(c.fixedLines.map((l) => l.frequencyHz)).toContain(100);
    for (const x of c.crossings) {
      expect((x.order * x.speedRpm) / 60).toBeCloseTo(x.naturalFrequencyHz, 9);
      expect(x.speedRpm).toBeGreaterThanOrEqual(1380);
      expect(x.speedRpm).toBeLessThanOrEqual(1500);
    }
  });

  it('rejects a speed range that is empty or reversed', () => {
    expect(() => campbellData(example, { speedRangeRpm: { minRpm: 1500, maxRpm: 1000 } })).toThrow(/speedRangeRpm/);
    expect(() => campbellData(example, { orders: [0] })).toThrow(/orders\[0\]/);
  });
});
