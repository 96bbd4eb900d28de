import type { MachineModel } from '@kinespec/kinematics';

const keys = new WeakMap<MachineModel, string>();

/**
 * A string that tells models apart by content (their JSON), computed once per model object. Caches of
 * model-derived data key on it rather than on the object: the service hands each analysis a fresh copy of the
 * same model (worker threads receive structured clones).
 */
export function modelKey(model: MachineModel): string {
  let key = keys.get(model);
  if (key === undefined) {
    key = JSON.stringify(model);
    keys.set(model, key);
  }
  return key;
}
