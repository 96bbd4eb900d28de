import { describe, expect, it } from 'vitest';
import type { MachineSummary } from './api-types.js';
import { concernLevel, filterMachines, indicatorRise, risingRows, sortMachines, sparklineWeeks } from './fleet-order.js';

// Invented fleet: the orderings below are worked out by hand from the rules in fleet-order.ts.
function machine(id: string, over: Partial<MachineSummary> = {}): MachineSummary {
  return {
    id,
    name: id,
    modelVersion: 1,
    worstZone: 'A',
    topHypothesis: null,
    lastMeasuredAt: '2025-03-01T08:00:00Z',
    activeAlarms: 0,
    mainIndicator: null,
    ...over,
  };
}

const fleet = [
  machine('cooling-fan', { worstZone: 'B' }),
  machine('mill-gearbox', { worstZone: 'B', topHypothesis: { fault: 'gear-missing-tooth', component: 'pinion-1', score: 0.81 } }),
  machine('feed-pump', { worstZone: 'C' }),
  machine('spare-motor', { worstZone: null, lastMeasuredAt: null }),
  machine('kiln-drive', { worstZone: 'D' }),
  machine('conveyor', { worstZone: 'A', activeAlarms: 1 }),
  machine('blower', { worstZone: 'B', topHypothesis: { fault: 'bearing-outer-race', component: 'nde', score: 0.62 } }),
];

describe('concernLevel', () => {
  it('puts zone D and active alarms first, zone C and fault hypotheses next', () => {
    expect(fleet.map((m) => [m.id, concernLevel(m)])).toEqual([
      ['cooling-fan', 1],
      ['mill-gearbox', 2],
      ['feed-pump', 2],
      ['spare-motor', 0],
      ['kiln-drive', 3],
      ['conveyor', 3],
      ['blower', 2],
    ]);
  });

  it('does not count a hypothesis below 0.5 as a fault', () => {
    expect(concernLevel(machine('x', { topHypothesis: { fault: 'unbalance', component: 'fan', score: 0.49 } }))).toBe(1);
  });
});

describe('sortMachines', () => {
  it('orders by concern, then score, then zone, then name by default', () => {
    // kiln-drive and conveyor share level 3 and no score; zone D sorts before zone A.
    expect(sortMachines(fleet).map((m) => m.id)).toEqual([
      'kiln-drive', 'conveyor', 'mill-gearbox', 'blower', 'feed-pump', 'cooling-fan', 'spare-motor',
    ]);
  });

  it('sorts by name ascending and by score descending when asked', () => {
    expect(sortMachines(fleet, 'name', 'asc').map((m) => m.id)).toEqual([
      'blower', 'conveyor', 'cooling-fan', 'feed-pump', 'kiln-drive', 'mill-gearbox', 'spare-motor',
    ]);
    expect(sortMachines(fleet, 'score', 'desc').slice(0, 2).map((m) => m.id)).toEqual(['mill-gearbox', 'blower']);
  });

  it('does not reorder its input', () => {
    const before = fleet.map((m) => m.id);
    sortMachines(fleet, 'zone', 'asc');
    expect(fleet.map((m) => m.id)).toEqual(before);
  });
});

describe('filterMachines', () => {
  it('keeps zone C or worse', () => {
    expect(filterMachines(fleet, { text: '', minZone: 'C', faultsOnly: false }).map((m) => m.id)).toEqual(['feed-pump', 'kiln-drive']);
  });

  it('keeps machines with a fault hypothesis and matches words in any field', () => {
    expect(filterMachines(fleet, { text: '', minZone: null, faultsOnly: true }).map((m) => m.id)).toEqual(['mill-gearbox', 'blower']);
    expect(filterMachines(fleet, { text: 'outer NDE', minZone: null, faultsOnly: false }).map((m) => m.id)).toEqual(['blower']);
  });
});

describe('indicatorRise', () => {
  it('is the relative change from the first to the last bucket', () => {
    const m = machine('x', { mainIndicator: { indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', sparkline: [
      { start: '2025-01-06', mean: 2 }, { start: '2025-01-13', mean: 2.5 }, { start: '2025-01-20', mean: 3 },
    ] } });
    expect(indicatorRise(m)).toBeCloseTo(0.5, 12);
    expect(indicatorRise(machine('y'))).toBeNull();
  });
});

describe('risingRows', () => {
  const rows = [
    { machineId: 'fan', risePercent: 283 },
    { machineId: 'conveyor', risePercent: 148 },
    { machineId: 'pump', risePercent: 0.2 },
    { machineId: 'blower', risePercent: -12 },
  ];
  it('keeps only machines the filter shows, and only real rises (no "+0 %" rows, no falls)', () => {
    expect(risingRows(rows, new Set(['fan', 'conveyor', 'pump', 'blower'])).map((r) => r.machineId)).toEqual(['fan', 'conveyor']);
    expect(risingRows(rows, new Set(['conveyor', 'pump'])).map((r) => r.machineId)).toEqual(['conveyor']);
  });
});

describe('sparklineWeeks', () => {
  it('counts the weeks between the first and the last weekly bucket', () => {
    const weeks = ['2026-09-14', '2026-09-21', '2026-11-30'].map((d) => ({ start: `${d}T00:00:00.000Z`, mean: 1 }));
    expect(sparklineWeeks({ mainIndicator: { indicator: 'v', unit: 'mm/s', sparkline: weeks } } as never)).toBe(11);
    expect(sparklineWeeks({ mainIndicator: null } as never)).toBeNull();
  });
});
