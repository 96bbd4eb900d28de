import { readdirSync, readFileSync } from 'node:fs';
import { componentLines, loadMachineModel, shaftRatios, type MachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { bearingDefectLines, catalogueLines, runningLines } from './catalogue.js';

const dir = new URL('../../../fixtures/machines/', import.meta.url);
const models: MachineModel[] = readdirSync(dir)
  .filter((f) => f.endsWith('.json'))
  .map((f) => loadMachineModel(readFileSync(new URL(f, dir), 'utf8')));
const speedsHz = (m: MachineModel) => [0.37, 1, 7.77, 24.43, m.speed.nominalRpm / 60, (m.speed.maxRpm ?? m.speed.nominalRpm) / 60 * 1.013, 103.1];

// The references: componentLines asked directly at each speed, as the analysis did before the catalogue was kept per model.
const reference = new Set(['synchronous-speed', 'slip', 'pole-pass', 'hunting-tooth', 'assembly-phase']);
function directCatalogue(model: MachineModel, speedHz: number) {
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const bearingShaft = new Map(model.bearings.map((b) => [b.id, b.shaft]));
  return componentLines(model, speedHz, { sidebands: 3, bearingSidebands: 1 }).filter((l) => !reference.has(l.family)).map((l) => ({
    frequencyHz: l.frequencyHz,
    component: l.component,
    label: l.label,
    kind: l.componentKind,
    ...(l.componentKind === 'shaft' || l.componentKind === 'rotor' || l.componentKind === 'bearing'
      ? { shaftRatio: ratio.get(l.shaft ?? bearingShaft.get(l.component) ?? '') }
      : {}),
    bearing: l.componentKind === 'bearing',
    shaftHarmonic: l.family === 'shaft-harmonic',
  }));
}
const zeroFamilies = { 'shaft-harmonic': 0, 'gear-mesh': 0, 'mesh-sideband': 0, 'hunting-tooth': 0, 'assembly-phase': 0, 'bearing-bpfo': 0, 'bearing-bpfi': 0, 'bearing-bsf': 0, 'bearing-ftf': 0, 'bearing-sideband': 0, 'blade-pass': 0, 'belt-pass': 0, 'line-frequency': 0, 'synchronous-speed': 0, slip: 0, 'pole-pass': 0 } as const;
function directRunning(model: MachineModel, speedHz: number) {
  return componentLines(model, speedHz, { maxHarmonic: { ...zeroFamilies, 'shaft-harmonic': 2, 'gear-mesh': 3, 'blade-pass': 2, 'line-frequency': 1 }, sidebands: 0, bearingSidebands: 0 })
    .map((l) => ({ frequencyHz: l.frequencyHz, component: l.component, label: l.label }));
}
function directBearing(model: MachineModel, speedHz: number) {
  return componentLines(model, speedHz, { maxHarmonic: { ...zeroFamilies, 'bearing-bpfo': 1, 'bearing-bpfi': 1, 'bearing-bsf': 1, 'bearing-ftf': 1 }, sidebands: 0, bearingSidebands: 0 })
    .filter((l) => l.componentKind === 'bearing' && l.harmonic === 1)
    .map((l) => ({ family: l.family, frequencyHz: l.frequencyHz }));
}

describe('catalogueLines', () => {
  it('gives, for every demo machine at any speed, the lines componentLines gives at that speed, bit for bit and in order', () => {
    expect(models.length).toBeGreaterThanOrEqual(5);
    for (const m of models) {
      for (const s of speedsHz(m)) {
        const got = catalogueLines(m, s);
        const want = directCatalogue(m, s);
        expect(got).toEqual(want);
        got.forEach((l, i) => expect(Object.is(l.frequencyHz, want[i]!.frequencyHz)).toBe(true));
      }
    }
  });
});

describe('runningLines', () => {
  it('gives the 1×, 2×, mesh 1–3×, blade pass 1–2× and 2× line frequency lines componentLines gives, bit for bit and in order', () => {
    for (const m of models) for (const s of speedsHz(m)) expect(runningLines(m, s)).toEqual(directRunning(m, s));
  });
});

describe('bearingDefectLines', () => {
  it('gives the first-order BPFO, BPFI, BSF and FTF of every bearing as componentLines gives them', () => {
    for (const m of models) for (const s of speedsHz(m)) expect(bearingDefectLines(m, s)).toEqual(directBearing(m, s));
  });
});
