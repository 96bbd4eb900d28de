import { gearStageGeometry, type GearStageGeometry } from './gear-geometry.js';
import type { GearStageDynamics, GearTrainSpec, TorsionalLinkDynamics } from './gear-train.js';
import type { ModelTorsionalLink } from './machine-model-document.js';
import type { Random } from './random.js';
import type { RigMachine } from './rig-machine.js';
import { FAULT_SIZE_RANGES, type FaultSize, type RigFault } from './rig-faults.js';
import { pairContact, ToothPairMesh } from './tooth-pair-mesh.js';

/**
 * Builds the lumped gear train of a rig machine for one recording: the machine's data, the operating point, the
 * random manufacturing deviations of this particular gearbox, and the gear faults.
 */
export interface OperatingPoint {
  /** Speed of the motor (input shaft), rad/s. */
  inputSpeedRadPerS: number;
  /** Torque the motor delivers at this point, N·m. */
  motorTorqueNm: number;
  /** Torque-speed slope of the motor, N·m·s/rad (> 0). */
  motorTorqueSlopeNmsPerRad: number;
  /** Load torque-speed slope at the load, N·m·s/rad (>= 0). */
  loadTorqueSlopeNmsPerRad: number;
}

/**
 * Manufacturing and damping assumptions (each drawn per recording in its range):
 * - single pitch deviations with σ 1.5-4 µm: ISO 1328-1 accuracy grades 5-7 allow fpt of roughly 5-12 µm at these
 *   modules and diameters (from memory), and a tolerance is about three standard deviations of a capable process;
 * - healthy eccentricity 3-10 µm (see FAULT_SIZE_RANGES);
 * - mesh damping ratio 0.05-0.10 of the mesh mode's critical damping (values of 0.03-0.17 are used in the lumped
 *   gear literature, e.g. Kahraman & Singh 1990; from memory);
 * - tip relief equal to one pair's deflection at rated load (0.8-1.2 of it), over the double-contact zone
 *   ("long relief"; the usual design rule of relieving the tip by the loaded deflection, from memory);
 * - coupling and shaft damping ratio 0.03-0.08, bearing support damping ratio 0.02-0.05 (assumed).
 */
export const PITCH_DEVIATION_SIGMA_UM: [number, number] = [1.5, 4];
export const HEALTHY_ECCENTRICITY_UM: [number, number] = [3, 10];
export const MESH_DAMPING_RATIO: [number, number] = [0.05, 0.1];
export const TIP_RELIEF_SCATTER: [number, number] = [0.8, 1.2];
export const LINK_DAMPING_RATIO: [number, number] = [0.03, 0.08];
export const SUPPORT_DAMPING_RATIO: [number, number] = [0.02, 0.05];

export interface AssembledGearTrain {
  spec: GearTrainSpec;
  geometries: GearStageGeometry[];
  /** Physical size of each gear fault applied, keyed by fault index in the list given. */
  faultSizes: Map<number, FaultSize>;
}

function inertia(machine: RigMachine, id: string): number {
  const i = machine.model.torsional?.inertias.find((x) => x.id === id);
  if (i === undefined) throw new RangeError(`${machine.model.id}: torsional inertia ${id} is missing`);
  return i.kgM2;
}

/** Torsional stiffness of a link: its own, or k = G·π·d⁴/(32·L) for a solid round shaft (any strength-of-materials text). */
export function linkStiffnessNmPerRad(link: ModelTorsionalLink): number {
  if (link.stiffnessNmPerRad !== undefined) return link.stiffnessNmPerRad;
  const { diameterMm, lengthMm, shearModulusGPa } = link;
  if (diameterMm === undefined || lengthMm === undefined || shearModulusGPa === undefined) throw new RangeError(`link ${link.id} has neither a stiffness nor a shaft geometry`);
  const d = diameterMm / 1000;
  return (shearModulusGPa * 1e9 * Math.PI * d ** 4) / (32 * (lengthMm / 1000));
}

function link(machine: RigMachine, a: string, b: string): ModelTorsionalLink {
  const l = machine.model.torsional?.links.find((x) => (x.from === a && x.to === b) || (x.from === b && x.to === a));
  if (l === undefined) throw new RangeError(`${machine.model.id}: no torsional link between ${a} and ${b}`);
  return l;
}

/** Accumulated pitch deviations of a gear's teeth: a random walk of single pitch deviations, closed over one turn. */
function accumulatedPitchDeviations(random: Random, teeth: number, sigmaM: number): Float64Array {
  const single = Array.from({ length: teeth }, () => sigmaM * random.normal());
  const mean = single.reduce((s, x) => s + x, 0) / teeth;
  const out = new Float64Array(teeth);
  let acc = 0;
  for (let i = 0; i < teeth; i++) {
    acc += single[i]! - mean; // the deviations of one turn sum to zero: the last tooth meets the first
    out[i] = acc;
  }
  return out;
}

export function assembleGearTrain(machine: RigMachine, op: OperatingPoint, faults: readonly RigFault[], random: Random): AssembledGearTrain {
  if (machine.gearStages.length === 0) throw new RangeError(`${machine.model.id} has no gear stages`);
  const { motorInertiaId, loadInertiaId } = machine;
  if (motorInertiaId === undefined || loadInertiaId === undefined) throw new RangeError(`${machine.model.id}: motorInertiaId and loadInertiaId are required for a gear train`);
  const faultSizes = new Map<number, FaultSize>();
  const geometries = machine.gearStages.map(gearStageGeometry);
  const stages: GearStageDynamics[] = [];
  const chain = [motorInertiaId, ...machine.gearStages.flatMap((s) => [s.pinionId, s.wheelId]), loadInertiaId];
  let torque = op.motorTorqueNm;
  const ratedTorque = (machine.drive.ratedPowerKw * 1000) / ((machine.model.speed.nominalRpm * 2 * Math.PI) / 60);
  let ratedStageTorque = ratedTorque;

  machine.gearStages.forEach((st, i) => {
    const g = geometries[i]!;
    const Jp = inertia(machine, st.pinionId);
    const Jg = inertia(machine, st.wheelId);
    const pinionBody = machine.gearBodies[st.pinionId];
    const wheelBody = machine.gearBodies[st.wheelId];
    if (pinionBody === undefined || wheelBody === undefined) throw new RangeError(`${machine.model.id}: gear body data missing for stage ${st.meshId}`);
    const pinionStiffness = new Float64Array(st.pinionTeeth).fill(1);
    const wheelStiffness = new Float64Array(st.wheelTeeth).fill(1);
    const pinionWear = new Float64Array(st.pinionTeeth);
    const wheelWear = new Float64Array(st.wheelTeeth);
    const sigma = random.between(...PITCH_DEVIATION_SIGMA_UM) * 1e-6;
    const pinionPitch = accumulatedPitchDeviations(random, st.pinionTeeth, sigma);
    const wheelPitch = accumulatedPitchDeviations(random, st.wheelTeeth, sigma);
    let pinionEcc = random.between(...HEALTHY_ECCENTRICITY_UM) * 1e-6;
    let wheelEcc = random.between(...HEALTHY_ECCENTRICITY_UM) * 1e-6;

    faults.forEach((f, fi) => {
      const range = FAULT_SIZE_RANGES[f.fault];
      const onPinion = f.component === st.pinionId;
      const onWheel = f.component === st.wheelId;
      if (f.fault === 'gear-wear' && f.component === st.meshId) {
        const depth = random.between(...range[f.severity]);
        // Both flanks of a mesh wear together; tooth to tooth the depth scatters by ±30 % (assumed).
        for (let t = 0; t < st.pinionTeeth; t++) pinionWear[t] = (depth / 2) * 1e-6 * random.between(0.7, 1.3);
        for (let t = 0; t < st.wheelTeeth; t++) wheelWear[t] = (depth / 2) * 1e-6 * random.between(0.7, 1.3);
        faultSizes.set(fi, { quantity: range.quantity, value: depth, unit: range.unit });
        return;
      }
      if (!onPinion && !onWheel) return;
      if (f.fault === 'gear-missing-tooth' || f.fault === 'gear-broken-tooth') {
        const size = random.between(...range[f.severity]);
        const kept = f.fault === 'gear-missing-tooth' ? size : 1 - size;
        const teeth = onPinion ? pinionStiffness : wheelStiffness;
        teeth[random.integer(0, teeth.length - 1)] = kept;
        faultSizes.set(fi, { quantity: range.quantity, value: size, unit: range.unit });
      } else if (f.fault === 'gear-eccentricity') {
        const ecc = random.between(...range[f.severity]);
        if (onPinion) pinionEcc = ecc * 1e-6;
        else wheelEcc = ecc * 1e-6;
        faultSizes.set(fi, { quantity: range.quantity, value: ecc, unit: range.unit });
      }
    });

    // Mesh damping against the mesh mode's equivalent mass m_e = 1/(r_bp²/J_p + r_bg²/J_g) (e.g. Kahraman & Singh 1990).
    const equivalentMass = 1 / ((g.baseRadiusPinionM ** 2) / Jp + (g.baseRadiusWheelM ** 2) / Jg);
    const meanDamping = 2 * random.between(...MESH_DAMPING_RATIO) * Math.sqrt(g.meanMeshStiffnessNPerM * equivalentMass);
    const ratedForce = ratedStageTorque / g.baseRadiusPinionM;
    const tipRelief = (ratedForce / pairContact(g).peakPairStiffnessNPerM) * random.between(...TIP_RELIEF_SCATTER);
    const mesh = new ToothPairMesh({
      geometry: g,
      pinionTeeth: st.pinionTeeth,
      wheelTeeth: st.wheelTeeth,
      meanDampingNsPerM: meanDamping,
      pinionToothStiffness: pinionStiffness,
      wheelToothStiffness: wheelStiffness,
      pinionPitchDeviationM: pinionPitch,
      wheelPitchDeviationM: wheelPitch,
      tipReliefM: tipRelief,
      reliefLengthPitches: Math.max(0.2, g.transverseContactRatio - 1),
      pinionWearM: pinionWear,
      wheelWearM: wheelWear,
    });
    const supportDamping = (k: number, m: number) => 2 * random.between(...SUPPORT_DAMPING_RATIO) * Math.sqrt(k * m);
    stages.push({
      mesh,
      pinionTeeth: st.pinionTeeth,
      wheelTeeth: st.wheelTeeth,
      baseRadiusPinionM: g.baseRadiusPinionM,
      baseRadiusWheelM: g.baseRadiusWheelM,
      pinionInertiaKgM2: Jp,
      wheelInertiaKgM2: Jg,
      pinionMassKg: pinionBody.massKg,
      wheelMassKg: wheelBody.massKg,
      pinionSupportNPerM: pinionBody.supportStiffnessNPerM,
      pinionSupportNsPerM: supportDamping(pinionBody.supportStiffnessNPerM, pinionBody.massKg),
      wheelSupportNPerM: wheelBody.supportStiffnessNPerM,
      wheelSupportNsPerM: supportDamping(wheelBody.supportStiffnessNPerM, wheelBody.massKg),
      pinionEccentricityM: pinionEcc,
      pinionEccentricityPhaseRad: random.between(0, 2 * Math.PI),
      wheelEccentricityM: wheelEcc,
      wheelEccentricityPhaseRad: random.between(0, 2 * Math.PI),
      meshPhasePitches: random.between(0, st.pinionTeeth * st.wheelTeeth),
    });
    torque = (torque * st.wheelTeeth) / st.pinionTeeth;
    ratedStageTorque = (ratedStageTorque * st.wheelTeeth) / st.pinionTeeth;
  });

  const links: TorsionalLinkDynamics[] = [];
  for (let l = 0; l + 1 < chain.length; l += 2) {
    const a = chain[l]!;
    const b = chain[l + 1]!;
    const k = linkStiffnessNmPerRad(link(machine, a, b));
    const Ja = inertia(machine, a);
    const Jb = inertia(machine, b);
    // Link damping against the two-inertia mode it forms: c = 2ζ·sqrt(k·J_a·J_b/(J_a + J_b)).
    const c = 2 * random.between(...LINK_DAMPING_RATIO) * Math.sqrt((k * Ja * Jb) / (Ja + Jb));
    links.push({ stiffnessNmPerRad: k, dampingNmsPerRad: c });
  }

  const spec: GearTrainSpec = {
    inputSpeedRadPerS: op.inputSpeedRadPerS,
    motorInertiaKgM2: inertia(machine, motorInertiaId),
    motorTorqueNm: op.motorTorqueNm,
    motorTorqueSlopeNmsPerRad: op.motorTorqueSlopeNmsPerRad,
    loadInertiaKgM2: inertia(machine, loadInertiaId),
    loadTorqueNm: torque,
    loadTorqueSlopeNmsPerRad: op.loadTorqueSlopeNmsPerRad,
    stages,
    links,
  };
  return { spec, geometries, faultSizes };
}
