import { describe, expect, it } from 'vitest';
import { campbellView, findCrossings } from './campbell-data.js';

// An order-k excitation at n rpm has frequency k·n/60 Hz (common practice), so it meets a
// natural frequency fn at n = 60·fn/k: 2× meets 50 Hz at exactly 1500 rpm.
describe('campbellView', () => {
  it('builds order rays over the speed grid and finds where they cross a natural frequency', () => {
    const view = campbellView({ speedsRpm: [0, 1000, 2000, 3000], naturalFrequenciesHz: [50], orders: [1, 2] }, {})!;
    expect(view.excitations[1]!.frequenciesHz).toEqual([0, 2000 / 60, 4000 / 60, 100]);
    expect(view.modes[0]!.frequenciesHz).toEqual([50, 50, 50, 50]);
    expect(view.crossings.map((c) => [Math.round(c.speedRpm * 1e6) / 1e6, c.frequencyHz])).toEqual([
      [3000, 50],
      [1500, 50],
    ]);
  });

  it('falls back to the model speed range and the lines when the endpoint sends no Campbell data', () => {
    const view = campbellView(undefined, { naturalFrequenciesHz: [30], orders: [{ order: 3, label: 'GMF' }], minRpm: 0, maxRpm: 1200 })!;
    expect(view.speedsRpm).toHaveLength(41);
    expect(view.crossings).toHaveLength(1);
    expect(view.crossings[0]!.speedRpm).toBeCloseTo(600, 9);
  });

  it('reads per-speed mode curves given as [mode][speed]', () => {
    const view = campbellView({ speedsRpm: [0, 600, 1200], modes: [{ label: 'torsion 1', frequenciesHz: [20, 21, 22] }], orders: [{ order: 2, label: '2×' }] }, {})!;
    // 2× ray: 0, 20, 40 Hz; mode: 20, 21, 22 Hz → crossing between 600 and 1200 rpm:
    // d(600) = -1, d(1200) = 18 → t = 1/19 → 600 + 600/19 rpm
    expect(view.crossings[0]!.speedRpm).toBeCloseTo(600 + 600 / 19, 9);
  });

  it('reads the signatures package shape: a speed range, labelled natural frequencies, orders and given crossings', () => {
    const view = campbellView(
      {
        speedRangeRpm: { minRpm: 300, maxRpm: 1500 },
        naturalFrequencies: [{ frequencyHz: 20, label: 'torsional mode 1', source: 'torsional' }],
        orders: [{ order: 2, label: '2× input', frequencyHzAtMin: 10, frequencyHzAtMax: 50 }],
        fixedLines: [{ frequencyHz: 100, label: '2×LF' }],
        crossings: [{ order: 2, orderLabel: '2× input', naturalFrequencyHz: 20, naturalFrequencyLabel: 'torsional mode 1', speedRpm: 600, nearNominal: false }],
      },
      {},
    )!;
    expect(view.speedsRpm[0]).toBe(300);
    expect(view.speedsRpm[view.speedsRpm.length - 1]).toBe(1500);
    // 2 × 1500 rpm / 60 = 50 Hz at the top of the range, as the package's frequencyHzAtMax says
    expect(view.excitations[0]!.frequenciesHz[view.speedsRpm.length - 1]).toBeCloseTo(50, 12);
    expect(view.modes[0]!.label).toBe('torsional mode 1 · 20.00 Hz');
    expect(view.fixedLines).toEqual([{ label: '2×LF', frequencyHz: 100 }]);
    expect(view.crossings).toEqual([{ label: '2× input × torsional mode 1', speedRpm: 600, frequencyHz: 20, nearNominal: false }]);
  });

  it('returns null when there is nothing to draw', () => {
    expect(campbellView(null, {})).toBeNull();
    expect(findCrossings({ speedsRpm: [0, 1], modes: [], excitations: [] })).toEqual([]);
  });
});
