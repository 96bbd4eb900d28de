import { readFileSync } from 'node:fs';
import { loadMachineModel, shaftRatios } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { add, gaussianNoise, sine } from '../test/signals.js';
import { envelopeStage } from './envelope-stage.js';

// The conveyor drive: hs-mesh (19 teeth on the input) and ls-mesh (24 teeth on the intermediate shaft).
const model = loadMachineModel(readFileSync(new URL('../../../fixtures/machines/skelmere-conveyor-drive-2.json', import.meta.url), 'utf8'));
const point = model.points.find((p) => p.id === 'gb-intermediate-a')!;
const fs = 19_600;
const n = 65_536;
const speedHz = 18.4;
const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
const hsMesh = 19 * speedHz;
const lsMesh = 24 * ratio.get('intermediate')! * speedHz;

describe('envelopeStage: no demodulation band where two running tones beat', () => {
  // |a1·e^{iω1t} + a2·e^{iω2t}|² = a1² + a2² + 2·a1·a2·cos((ω1 − ω2)t): the squared envelope of a band holding two
  // discrete tones has a line at their difference (a trigonometric identity); Randall & Antoni (MSSP 25:485–520,
  // 2011, §3) keep discrete components out of the demodulated band.
  const x = add(gaussianNoise(n, 5, 0.01), sine(n, fs, hsMesh, 1), sine(n, fs, 2 * lsMesh, 0.8), sine(n, fs, 3 * lsMesh, 0.5));

  it('the envelope of a band holding hs-mesh and 2× ls-mesh shows their difference, a line of neither family', () => {
    const stage = envelopeStage(x, fs, null, null, { referenceHz: null, unitHz: 1 }, { resolution: 0.5, unit: 'g', warnings: [] })!;
    const lo = Math.min(hsMesh, 2 * lsMesh) - 40;
    const hi = Math.max(hsMesh, 2 * lsMesh) + 40;
    const { spectrum } = stage.band({ lowHz: lo, highHz: hi });
    const beatHz = Math.abs(hsMesh - 2 * lsMesh);
    const at = (f: number) => spectrum.values[Math.round(f / spectrum.frequencyResolutionHz)]!;
    expect(at(beatHz)).toBeGreaterThan(100 * at(beatHz + 7.3));
  });

  it('offers the bearing hypotheses no band holding strong tones of two meshes, with the model and the speed known', () => {
    const warnings: string[] = [];
    const stage = envelopeStage(x, fs, model, { ...point, resonances: [] }, { referenceHz: speedHz, unitHz: 1 }, { resolution: 0.5, unit: 'g', warnings })!;
    const tones = [1, 2, 3].flatMap((h) => [{ hz: h * hsMesh, mesh: 'hs' }, { hz: h * lsMesh, mesh: 'ls' }]);
    expect(stage.source.bands.length).toBeGreaterThan(0);
    for (const b of stage.source.bands) {
      const inside = new Set(tones.filter((t) => t.hz >= b.lowHz && t.hz <= b.highHz).map((t) => t.mesh));
      expect(inside.size, `band ${b.lowHz}-${b.highHz} holds tones of ${[...inside].join(', ')}`).toBeLessThan(2);
    }
    // Without a model the paving is whole: the same record offers such bands.
    const whole = envelopeStage(x, fs, null, null, { referenceHz: null, unitHz: 1 }, { resolution: 0.5, unit: 'g', warnings: [] })!;
    expect(whole.source.bands.some((b) => b.lowHz <= lsMesh * 2 && b.highHz >= hsMesh)).toBe(true);
  });
});
