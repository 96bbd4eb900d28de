import type { Bearing } from '@kinespec/kinematics';
import { SimulatorInputError } from './errors.js';

export interface BearingOrders {
  bpfo: number;
  bpfi: number;
  bsf: number;
  ftf: number;
}

/** Defect orders of a bearing (multiples of its shaft speed, stationary outer race). */
export function bearingOrders(bearing: Bearing): BearingOrders {
  if (bearing.faultOrders) return bearing.faultOrders;
  const n = bearing.rollingElements;
  const d = bearing.rollingElementDiameterMm;
  const D = bearing.pitchDiameterMm;
  if (n === undefined || d === undefined || D === undefined) {
    throw new SimulatorInputError('bearing_definition', `bearing '${bearing.id}' has neither faultOrders nor a complete geometry`);
  }
  const c = (d / D) * Math.cos(((bearing.contactAngleDeg ?? 0) * Math.PI) / 180);
  // Harris & Kotzalas, Rolling Bearing Analysis (2007): kinematic defect frequencies for a stationary outer race.
  return { bpfo: (n / 2) * (1 - c), bpfi: (n / 2) * (1 + c), bsf: (D / (2 * d)) * (1 - c * c), ftf: 0.5 * (1 - c) };
}
