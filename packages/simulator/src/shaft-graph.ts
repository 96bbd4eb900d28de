import type { MachineModel } from '@kinespec/kinematics';
import { SimulatorInputError } from './errors.js';

/**
 * The simulator's own view of the drive train: each shaft's speed over the reference shaft's, and how
 * many belts or meshes lie between two shafts (the farther a source, the weaker it reaches a sensor).
 * Computed here, not taken from the kinematics package, so that the simulated physics stays independent
 * of the code under evaluation.
 */
export interface ShaftGraph {
  ratio(shaftId: string): number;
  hops(fromShaft: string, toShaft: string): number;
}

export function shaftGraph(model: MachineModel): ShaftGraph {
  const neighbours = new Map<string, Array<{ other: string; factor: number }>>();
  const link = (a: string, b: string, factor: number) => {
    neighbours.set(a, [...(neighbours.get(a) ?? []), { other: b, factor }]);
    neighbours.set(b, [...(neighbours.get(b) ?? []), { other: a, factor: 1 / factor }]);
  };
  // Common practice: a belt drives at D_driver/D_driven, the driven sheave creeping behind by the slip.
  for (const b of model.belts) link(b.driver.shaft, b.driven.shaft, (b.driver.pitchDiameterMm / b.driven.pitchDiameterMm) * (1 - (b.slipPercent ?? 0) / 100));
  // Common practice: a gear pair turns at N_driver/N_driven (equal tooth-passing rates).
  for (const m of model.gearMeshes) link(m.driver.shaft, m.driven.shaft, m.driver.teeth / m.driven.teeth);

  const ratios = new Map<string, number>([[model.speed.shaft, 1]]);
  const queue = [model.speed.shaft];
  for (let head = 0; head < queue.length; head++) {
    const shaft = queue[head]!;
    for (const { other, factor } of neighbours.get(shaft) ?? []) {
      if (ratios.has(other)) continue;
      ratios.set(other, ratios.get(shaft)! * factor);
      queue.push(other);
    }
  }
  const distances = new Map<string, Map<string, number>>();
  const distanceFrom = (start: string) => {
    let d = distances.get(start);
    if (d) return d;
    d = new Map([[start, 0]]);
    const q = [start];
    for (let head = 0; head < q.length; head++) {
      const s = q[head]!;
      for (const { other } of neighbours.get(s) ?? []) {
        if (d.has(other)) continue;
        d.set(other, d.get(s)! + 1);
        q.push(other);
      }
    }
    distances.set(start, d);
    return d;
  };
  return {
    ratio(shaftId) {
      const r = ratios.get(shaftId);
      if (r === undefined) throw new SimulatorInputError('unknown_shaft', `shaft '${shaftId}' is not connected to the reference shaft '${model.speed.shaft}'`);
      return r;
    },
    hops(fromShaft, toShaft) {
      return distanceFrom(fromShaft).get(toShaft) ?? 4;
    },
  };
}
