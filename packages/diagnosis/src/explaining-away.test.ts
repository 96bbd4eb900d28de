import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assertMachineModel } from '@kinespec/kinematics';
import { simulateRecording } from '@kinespec/simulator';
import { analyseRecording } from './analyse-recording.js';

// A localised gear fault puts a comb of its shaft's harmonics into the spectrum, besides the mesh sidebands
// (common practice; R. B. Randall, Vibration-based Condition Monitoring, Wiley 2011, ch. 2 — from memory). Its
// 1×, 2× and 3× are then the whole misalignment pattern; here they are the strongest lines, because the simulated
// point carries a structural resonance near them. The tooth fault must win and misalignment be explained away.
const model = assertMachineModel(JSON.parse(readFileSync(new URL('../../../fixtures/machines/skelmere-conveyor-drive-2.json', import.meta.url), 'utf8')));

describe('explaining away between hypotheses', () => {
  it('reports a broken tooth on the high-speed pinion as a tooth fault, not as misalignment of its shaft', () => {
    const recording = simulateRecording(model, {
      pointId: 'gb-output-v', sampleRateHz: 25600, sampleCount: 32768, speedRpm: model.speed.nominalRpm,
      faults: [{ fault: 'gear-broken-tooth', component: 'hs-pinion', severity: 1 }], seed: 5,
    });
    const a = analyseRecording(recording, { model, pointId: 'gb-output-v', speedRpm: model.speed.nominalRpm });
    const top = a.hypotheses[0]!;
    expect(top.fault).toMatch(/^gear-(missing|broken)-tooth$/);
    expect(top.component).toBe('hs-pinion');
    const misalignment = a.hypotheses.find((h) => h.fault === 'misalignment' && h.component === 'input')!;
    expect(misalignment.score).toBeLessThan(0.5);
    expect(misalignment.parts.explainedBy).toMatch(/^gear-(missing|broken)-tooth:hs-pinion$/);
  });
});
