import { validateMachineModel, type MachineModel } from '@kinespec/kinematics';
import type { Queryable } from './database.js';
import { getModelVersion } from './store.js';

/**
 * Machine model versions never change once stored, so each is read and validated once per process.
 * Bounded, oldest entry evicted first.
 */
export class ModelCache {
  private readonly entries = new Map<string, MachineModel>();

  constructor(private readonly capacity = 500) {}

  async get(sql: Queryable, machineId: number, version: number): Promise<MachineModel | null> {
    const key = `${machineId}:${version}`;
    const hit = this.entries.get(key);
    if (hit) return hit;
    const row = await getModelVersion(sql, machineId, version);
    if (!row) return null;
    const result = validateMachineModel(row.model);
    // a stored version passed validation when it was put; if a later validator rejects it, analyse without it
    if (!result.ok) return null;
    if (this.entries.size >= this.capacity) this.entries.delete(this.entries.keys().next().value!);
    this.entries.set(key, result.model);
    return result.model;
  }
}
