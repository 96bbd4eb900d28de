import { readFileSync } from 'node:fs';
import { loadMachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { buildCandidates } from './candidates.js';
import { judgedLevel, type LevelContext, type LevelLine } from './level.js';
import type { MatchableSpectrum } from './line-matching.js';

// The conveyor drive's gearbox: input shaft 19-tooth pinion, so its mesh is order 19 of the input (reference) shaft.
const model = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/skelmere-conveyor-drive-2.json', import.meta.url), 'utf8'));
const point = model.points.find((p) => p.id === 'gb-input-h')!;
const speedHz = 24.75;
const wear = buildCandidates(model, point, speedHz, 'g', { spectrumTopHz: 5000, spectrumLowHz: 1, spectrumResolutionHz: 0.5, envelopeTopHz: 0, envelopeLowHz: 0, maxLines: 48 }, [])
  .find((c) => c.fault === 'gear-wear' && c.component === 'hs-mesh')!;

function context(baselineOrders: LevelContext['baselineOrders']): LevelContext {
  return {
    model, unit: 'g', isoAbMmPerS: 1.4, isoBcMmPerS: 2.8, baseline: null, speedHz, measured: {} as MatchableSpectrum, uncertaintyHz: 0,
    unitHz: 1, referenceSpeedHz: speedHz, baselineOrders, pointUnit: 'g',
  };
}

/** The mesh's 1×, 2× and 3× found with these amplitudes (g). */
function meshLines(amplitudes: [number, number, number]): LevelLine[] {
  return amplitudes.map((a, i) => ({ matched: true, measuredHz: (i + 1) * 19 * speedHz, measuredAmplitude: a, toleranceHz: 0.5, predictedHz: (i + 1) * 19 * speedHz }));
}

describe('judgedLevel: wear is judged against a baseline only where the baseline holds its lines', () => {
  // Common practice (Randall 2011 ch. 2, from memory): wear raises 2× and 3× mesh; their ratio to 1× depends on the
  // path to the sensor, so only a change at the same point shows wear.
  it('a baseline that holds the mesh fundamental only does not judge 2× and 3× mesh (no baseline for this hypothesis)', () => {
    const lines = meshLines([0.3, 0.4, 0.35]);
    const judged = judgedLevel(wear, lines, context([{ order: 19, amplitude: 0.31 }]));
    expect(judged.againstBaseline).toBe(false);
    // Without a baseline, 2× above 1× counts fully (wearLevel) — the gate 'needs-baseline' then keeps it under 0.5.
    expect(judged.level).toBe(1);
  });

  it('a baseline that holds the mesh harmonics judges the rise against it: +12 dB counts fully, no rise nothing', () => {
    const orders = [{ order: 19, amplitude: 0.3 }, { order: 38, amplitude: 0.1 }, { order: 57, amplitude: 0.0875 }];
    const risen = judgedLevel(wear, meshLines([1.2, 0.4, 0.35]), context(orders));
    expect(risen.againstBaseline).toBe(true);
    expect(risen.level).toBeCloseTo(1, 6);
    const same = judgedLevel(wear, meshLines([0.3, 0.1, 0.0875]), context(orders));
    expect(same.againstBaseline).toBe(true);
    expect(same.level).toBe(0);
  });
});
