// The invented demo machines of fixtures/machines, which the simulated corpora run on.
import { readFileSync } from 'node:fs';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';

export const DEMO_MACHINES = ['aeration-mixer-2', 'skelmere-conveyor-drive-2', 'skelmere-feed-pump-3', 'skelmere-id-fan-1', 'skelmere-aeration-blower-1'] as const;

let cache: Record<string, MachineModel> | null = null;

export function demoMachines(): Readonly<Record<string, MachineModel>> {
  if (cache) return cache;
  const out: Record<string, MachineModel> = {};
  for (const m of DEMO_MACHINES) out[m] = loadMachineModel(readFileSync(new URL(`../../../fixtures/machines/${m}.json`, import.meta.url), 'utf8'));
  cache = out;
  return out;
}
