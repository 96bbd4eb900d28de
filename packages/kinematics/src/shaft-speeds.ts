import type { Belt, GearMesh, MachineModel } from './machine-model.js';
import { MachineModelError, type Problem } from './problem.js';

/** Speed of a driven sheave over the speed of its driver. */
// Common practice: belt speed ratio n_driven/n_driver = D_driver/D_driven, the driven sheave creeping behind by the slip.
export function beltSpeedRatio(belt: Pick<Belt, 'driver' | 'driven' | 'slipPercent'>): number {
  return (belt.driver.pitchDiameterMm / belt.driven.pitchDiameterMm) * (1 - (belt.slipPercent ?? 0) / 100);
}

/** Speed of a driven gear over the speed of its driver. */
// Common practice: n_driven/n_driver = N_driver/N_driven (equal tooth-passing rate on both gears).
export function gearMeshSpeedRatio(mesh: Pick<GearMesh, 'driver' | 'driven'>): number {
  return mesh.driver.teeth / mesh.driven.teeth;
}

/** One belt or gear mesh seen as an edge of the speed graph. */
export interface SpeedEdge {
  element: 'belt' | 'gear-mesh';
  /** Position in `belts` or `gearMeshes`. */
  index: number;
  id: string;
  driverShaft: string;
  drivenShaft: string;
  /** Driven speed over driver speed. */
  ratio: number;
}

export function speedEdges(model: Pick<MachineModel, 'belts' | 'gearMeshes'>): SpeedEdge[] {
  return [
    ...model.belts.map((b, index): SpeedEdge => ({
      element: 'belt', index, id: b.id, driverShaft: b.driver.shaft, drivenShaft: b.driven.shaft, ratio: beltSpeedRatio(b),
    })),
    ...model.gearMeshes.map((m, index): SpeedEdge => ({
      element: 'gear-mesh', index, id: m.id, driverShaft: m.driver.shaft, drivenShaft: m.driven.shaft, ratio: gearMeshSpeedRatio(m),
    })),
  ];
}

/** Relative tolerance within which two paths to a shaft count as the same ratio. */
export const RATIO_TOLERANCE = 1e-9;

export interface RatioPropagation {
  /** Shaft id -> speed over the reference speed, and the belt / mesh ids on the path that set it. */
  ratios: Map<string, { ratio: number; via: string[] }>;
  /** Shafts no path reaches. */
  disconnected: string[];
  /** Edges that close a loop with a different ratio than the path already found. */
  inconsistent: Array<{ edge: SpeedEdge; shaft: string; ratioAlongEdge: number; ratioFound: number }>;
}

/**
 * Breadth-first walk of the speed graph from the reference shaft. Edges are walked both ways
 * (a driven shaft may be nearer the reference than its driver); every edge that closes a loop is
 * checked against the ratio already found.
 */
export function propagateRatios(referenceShaft: string, shaftIds: readonly string[], edges: readonly SpeedEdge[]): RatioPropagation {
  const ratios = new Map<string, { ratio: number; via: string[] }>();
  const inconsistent: RatioPropagation['inconsistent'] = [];
  const known = new Set(shaftIds);
  const adjacency = new Map<string, Array<{ edge: SpeedEdge; other: string; factor: number }>>();
  const add = (shaft: string, entry: { edge: SpeedEdge; other: string; factor: number }) => {
    const list = adjacency.get(shaft);
    if (list) list.push(entry);
    else adjacency.set(shaft, [entry]);
  };
  for (const edge of edges) {
    if (!known.has(edge.driverShaft) || !known.has(edge.drivenShaft) || edge.driverShaft === edge.drivenShaft) continue;
    if (!(edge.ratio > 0) || !Number.isFinite(edge.ratio)) continue;
    add(edge.driverShaft, { edge, other: edge.drivenShaft, factor: edge.ratio });
    add(edge.drivenShaft, { edge, other: edge.driverShaft, factor: 1 / edge.ratio });
  }
  if (known.has(referenceShaft)) {
    ratios.set(referenceShaft, { ratio: 1, via: [] });
    const queue = [referenceShaft];
    const walked = new Set<SpeedEdge>();
    for (let head = 0; head < queue.length; head++) {
      const shaft = queue[head]!;
      const here = ratios.get(shaft)!;
      for (const { edge, other, factor } of adjacency.get(shaft) ?? []) {
        if (walked.has(edge)) continue;
        walked.add(edge);
        const along = here.ratio * factor;
        const found = ratios.get(other);
        if (!found) {
          ratios.set(other, { ratio: along, via: [...here.via, edge.id] });
          queue.push(other);
        } else if (Math.abs(along - found.ratio) > RATIO_TOLERANCE * Math.max(along, found.ratio)) {
          inconsistent.push({ edge, shaft: other, ratioAlongEdge: along, ratioFound: found.ratio });
        }
      }
    }
  }
  return { ratios, disconnected: shaftIds.filter((id) => !ratios.has(id)), inconsistent };
}

export interface ShaftRatio {
  shaft: string;
  /** Speed of this shaft over the speed of the reference shaft (independent of the running speed). */
  ratio: number;
  /** Belt and gear-mesh ids on the path from the reference shaft. */
  via: string[];
}

export interface ShaftSpeed extends ShaftRatio {
  speedRpm: number;
  speedHz: number;
}

/**
 * Every shaft's speed as a ratio to the reference shaft, in the order of `model.shafts`.
 * Throws MachineModelError for a model the validator would reject (disconnected shaft, inconsistent loop).
 */
export function shaftRatios(model: MachineModel): ShaftRatio[] {
  const { ratios, disconnected, inconsistent } = propagateRatios(
    model.speed.shaft,
    model.shafts.map((s) => s.id),
    speedEdges(model),
  );
  const problems: Problem[] = [
    ...disconnected.map((shaft): Problem => ({
      path: `shafts[${model.shafts.findIndex((s) => s.id === shaft)}]`,
      code: 'disconnected_shaft',
      message: `shaft '${shaft}' is not connected to the reference shaft '${model.speed.shaft}'`,
    })),
    ...inconsistent.map(({ edge, shaft }): Problem => ({
      path: `${edge.element === 'belt' ? 'belts' : 'gearMeshes'}[${edge.index}]`,
      code: 'inconsistent_ratio',
      message: `gives shaft '${shaft}' a different speed than another path`,
    })),
  ];
  if (problems.length > 0) throw new MachineModelError(problems);
  return model.shafts.map((s) => ({ shaft: s.id, ...ratios.get(s.id)! }));
}

/** The ratio of one shaft to the reference shaft. */
export function shaftRatio(model: MachineModel, shaftId: string): number {
  const found = shaftRatios(model).find((r) => r.shaft === shaftId);
  if (!found) throw new RangeError(`shaftId ('${shaftId}') is not a shaft of machine '${model.id}'`);
  return found.ratio;
}

function checkSpeed(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`${name} (${value}) must be a finite number > 0`);
}

/** Every shaft's speed when the reference shaft runs at `referenceSpeedRpm` (default: the nominal speed). */
export function shaftSpeeds(model: MachineModel, referenceSpeedRpm: number = model.speed.nominalRpm): ShaftSpeed[] {
  checkSpeed('referenceSpeedRpm', referenceSpeedRpm);
  return shaftRatios(model).map((r) => ({
    ...r,
    speedRpm: r.ratio * referenceSpeedRpm,
    speedHz: (r.ratio * referenceSpeedRpm) / 60,
  }));
}

/** Shaft id -> speed in Hz when the reference shaft turns at `referenceSpeedHz`. */
export function shaftSpeedsHz(model: MachineModel, referenceSpeedHz: number): Record<string, number> {
  checkSpeed('referenceSpeedHz', referenceSpeedHz);
  const out: Record<string, number> = {};
  for (const r of shaftRatios(model)) out[r.shaft] = r.ratio * referenceSpeedHz;
  return out;
}
