import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { evaluationCases } from './eval-cases.js';
import { runCase } from './evaluate.js';

// A few recordings of the `npm run eval` set, so that CI runs the whole pipeline end to end:
// @kinespec/simulator (time-domain physics, independent of @kinespec/signatures) -> @kinespec/diagnosis.
const MACHINES = ['aeration-mixer-2', 'skelmere-conveyor-drive-2', 'skelmere-feed-pump-3', 'skelmere-id-fan-1', 'skelmere-aeration-blower-1'];
const models: Record<string, MachineModel> = {};
for (const m of MACHINES) models[m] = loadMachineModel(readFileSync(new URL(`../../fixtures/machines/${m}.json`, import.meta.url), 'utf8'));

describe('diagnosis evaluation subset', () => {
  for (const c of evaluationCases(models, { subset: true })) {
    it(`diagnoses ${c.id} as built`, () => {
      const r = runCase(models[c.machine]!, c);
      if (c.fault === 'healthy') {
        expect(r.maxGearBearingScore).toBeLessThan(0.5);
        expect(r.predictedFault).toBe('healthy');
      } else {
        expect(r.trueScore).toBeGreaterThanOrEqual(0.5);
        expect(r.predictedComponent === c.component || c.fault === 'unbalance').toBe(true);
      }
      expect(Math.abs(r.speedErrorPercent)).toBeLessThan(0.1);
    });
  }
});
