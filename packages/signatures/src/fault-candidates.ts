import { motorComponentId, type MachineModel } from '@kinespec/kinematics';
import type { FaultComponentKind, FaultKind } from './fault-kinds.js';

export interface FaultCandidate {
  fault: FaultKind;
  component: string;
  componentKind: FaultComponentKind;
  /** The shaft the component turns with (for a motor: the motor shaft). */
  shaft: string;
}

/** Every gear of the model once (a gear in two meshes, e.g. an idler, is listed once), in file order. */
export function modelGears(model: MachineModel): Array<{ gear: string; shaft: string; teeth: number; mesh: string }> {
  const seen = new Set<string>();
  const out: Array<{ gear: string; shaft: string; teeth: number; mesh: string }> = [];
  for (const m of model.gearMeshes) {
    for (const side of [m.driver, m.driven]) {
      if (seen.has(side.gear)) continue;
      seen.add(side.gear);
      out.push({ gear: side.gear, shaft: side.shaft, teeth: side.teeth, mesh: m.id });
    }
  }
  return out;
}

/**
 * Every (fault, component) pair the model makes possible, in a stable order (by fault kind, then file order):
 * shafts for unbalance, misalignment and looseness; rotors for unbalance; every gear for the tooth faults and
 * eccentricity; every gear mesh for wear; every bearing for its four defects; the motor for electrical lines.
 */
export function faultCandidates(model: MachineModel): FaultCandidate[] {
  const out: FaultCandidate[] = [];
  const shafts = model.shafts.map((s) => s.id);
  const push = (fault: FaultKind, componentKind: FaultComponentKind, component: string, shaft: string) =>
    out.push({ fault, component, componentKind, shaft });
  for (const s of shafts) push('unbalance', 'shaft', s, s);
  for (const r of model.rotors) push('unbalance', 'rotor', r.id, r.shaft);
  for (const s of shafts) push('misalignment', 'shaft', s, s);
  for (const s of shafts) push('looseness', 'shaft', s, s);
  const gears = modelGears(model);
  for (const fault of ['gear-missing-tooth', 'gear-broken-tooth'] as const) for (const g of gears) push(fault, 'gear', g.gear, g.shaft);
  for (const m of model.gearMeshes) push('gear-wear', 'gear-mesh', m.id, m.driver.shaft);
  for (const g of gears) push('gear-eccentricity', 'gear', g.gear, g.shaft);
  for (const fault of ['bearing-outer-race', 'bearing-inner-race', 'bearing-rolling-element', 'bearing-cage'] as const) {
    for (const b of model.bearings) push(fault, 'bearing', b.id, b.shaft);
  }
  if (model.motor) push('electrical', 'motor', motorComponentId(model.motor), model.motor.shaft);
  return out;
}
