import type { MachineModel } from './machine-model.js';
import { beltSpeedRatio, gearMeshSpeedRatio } from './shaft-speeds.js';

/** How one belt or gear mesh joins the torsional chain, with the defaults filled in. */
export interface ResolvedCoupling {
  element: string;
  kind: 'belt' | 'gear-mesh';
  driverShaft: string;
  drivenShaft: string;
  /** Inertia on the driver shaft where the element attaches; null when that shaft carries none. */
  driverInertia: string | null;
  drivenInertia: string | null;
  /** Driven speed over driver speed. */
  ratio: number;
  /** Torsional stiffness referred to the driven shaft; null for a rigid coupling. */
  stiffnessNmPerRad: number | null;
}

/**
 * Every belt and gear mesh of a model with a torsional section, as a coupling of two inertias.
 * Defaults where `torsional.couplings` says nothing: a gear mesh attaches at the inertias whose ids are its
 * gears' ids (the gear bodies), else at the first inertia listed on the shaft; a belt attaches at the first
 * inertia listed on the shaft that is not a gear body (its sheave), else the first one. Rigid unless a stiffness is given.
 */
export function resolveTorsionalCouplings(model: MachineModel): ResolvedCoupling[] {
  const t = model.torsional;
  if (!t) return [];
  const gearIds = new Set(model.gearMeshes.flatMap((m) => [m.driver.gear, m.driven.gear]));
  const onShaft = (shaft: string) => t.inertias.filter((i) => i.shaft === shaft);
  const given = new Map((t.couplings ?? []).map((c) => [c.element, c]));
  const pick = (shaft: string, preferred: string | undefined, gear: string | undefined): string | null => {
    const here = onShaft(shaft);
    if (preferred !== undefined) return preferred;
    if (gear !== undefined) return (here.find((i) => i.id === gear) ?? here[0])?.id ?? null;
    return (here.find((i) => !gearIds.has(i.id)) ?? here[0])?.id ?? null;
  };
  return [
    ...model.belts.map((b): ResolvedCoupling => {
      const c = given.get(b.id);
      return {
        element: b.id, kind: 'belt', driverShaft: b.driver.shaft, drivenShaft: b.driven.shaft,
        driverInertia: pick(b.driver.shaft, c?.driverInertia, undefined),
        drivenInertia: pick(b.driven.shaft, c?.drivenInertia, undefined),
        ratio: beltSpeedRatio(b), stiffnessNmPerRad: c?.stiffnessNmPerRad ?? null,
      };
    }),
    ...model.gearMeshes.map((m): ResolvedCoupling => {
      const c = given.get(m.id);
      return {
        element: m.id, kind: 'gear-mesh', driverShaft: m.driver.shaft, drivenShaft: m.driven.shaft,
        driverInertia: pick(m.driver.shaft, c?.driverInertia, m.driver.gear),
        drivenInertia: pick(m.driven.shaft, c?.drivenInertia, m.driven.gear),
        ratio: gearMeshSpeedRatio(m), stiffnessNmPerRad: c?.stiffnessNmPerRad ?? null,
      };
    }),
  ];
}
