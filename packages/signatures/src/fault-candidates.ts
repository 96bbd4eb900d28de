import { motorComponentId, type MachineModel } from '@kinespec/kinematics';
import { faultComponentKinds, faultKinds, type FaultComponentKind, type FaultKind } from './fault-kinds.js';

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
  const gears = modelGears(model);
  // Every component of a kind, with the shaft it turns with: the one place a component kind is enumerated, so that a
  // new fault kind needs only its entry in @kinespec/kinematics' fault facts.
  const componentsOf: Record<FaultComponentKind, Array<{ component: string; shaft: string }>> = {
    shaft: model.shafts.map((s) => ({ component: s.id, shaft: s.id })),
    rotor: model.rotors.map((r) => ({ component: r.id, shaft: r.shaft })),
    gear: gears.map((g) => ({ component: g.gear, shaft: g.shaft })),
    'gear-mesh': model.gearMeshes.map((m) => ({ component: m.id, shaft: m.driver.shaft })),
    bearing: model.bearings.map((b) => ({ component: b.id, shaft: b.shaft })),
    motor: model.motor ? [{ component: motorComponentId(model.motor), shaft: model.motor.shaft }] : [],
  };
  const out: FaultCandidate[] = [];
  for (const fault of faultKinds) {
    for (const componentKind of faultComponentKinds[fault]) {
      for (const c of componentsOf[componentKind]) out.push({ fault, component: c.component, componentKind, shaft: c.shaft });
    }
  }
  return out;
}
